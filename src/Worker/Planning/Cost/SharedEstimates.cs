using System.Collections.Concurrent;
using System.Runtime.CompilerServices;
using System.Text;
using LatticeSweep.Worker.Planning.Specs;

namespace LatticeSweep.Worker.Planning.Cost;

/// <summary>
/// A plan's run-time estimates computed once per cost shape instead of once per point. The estimate
/// (<see cref="PointCost.WorkOf"/>) reads a model's branch count, dimension and components per site,
/// the sample's size and the options, and a mass or a spring constant only where a 2D or 3D bulk point plans its long
/// waves (boxes, face rules and trials: <see cref="LatticeSweep.Engine.Solving.PhononSolver.PlanBulkPoint"/>) or asks for
/// a conductivity (the q = 0 cell's face panels and the hand-over depend on the long waves:
/// <see cref="LatticeSweep.Engine.Transport.ConductivityWork.LongWaveCounts"/>); there a shape takes the counts of the first of
/// its points estimated, an approximation where a sweep moves the sound speeds' anisotropy; so in a sweep of a lattice
/// model without potentials, bends or relaxation, points that differ only in site masses and spring
/// or bond constants (values the field checks keep finite and masses positive, so the model builds
/// or fails alike) share one estimate. Any other swept column is part of the shape's key. Samples with
/// free surfaces, shapes or disorder (the Engine's own flop estimate) are estimated point by point.
/// </summary>
internal sealed class SharedEstimates
{
    private static readonly ConditionalWeakTable<SweepPlan, SharedEstimates> Plans = new();

    private readonly HashSet<string> _neutral;
    private readonly ConcurrentDictionary<string, double> _byShape = new(StringComparer.Ordinal);
    private readonly bool _shareable;
    private KeyLayout? _layout;

    private SharedEstimates(SweepPlan plan)
    {
        var template = plan.Template;
        _shareable = template.Base.Model is LatticeModelSpec { Potentials.IsEmpty: true, Bends.IsEmpty: true, Relax: false };
        var bound = template.Bindings.Select(b => b.Column).ToHashSet(StringComparer.Ordinal);

        // Columns that set no field (a candidates table's kept text) change nothing the estimate reads.
        _neutral = template.Bindings.Where(b => IsCostNeutral(b.Field.Path)).Select(b => b.Column)
            .Concat(plan.Axes.Select(a => a.ColumnName).Where(c => !bound.Contains(c)))
            .ToHashSet(StringComparer.Ordinal);
    }

    public static SharedEstimates For(SweepPlan plan) => Plans.GetValue(plan, p => new SharedEstimates(p));

    /// <summary>Fields a lattice model's estimate never reads (see the class summary).</summary>
    internal static bool IsCostNeutral(string path) =>
        (path.StartsWith("model.sites.", StringComparison.Ordinal) && path.EndsWith(".mass_amu", StringComparison.Ordinal))
        || ((path.StartsWith("model.springs[", StringComparison.Ordinal) || path.StartsWith("model.bonds[", StringComparison.Ordinal))
            && (path.EndsWith("].longitudinal_n_per_m", StringComparison.Ordinal) || path.EndsWith("].transverse_n_per_m", StringComparison.Ordinal)));

    /// <summary>The point's estimate: its shape's, or <paramref name="estimate"/> of the point when its shape has none yet or cannot share one.</summary>
    public double Seconds(PointParameters parameters, Func<PointParameters, (double Seconds, BoundSpec Spec)> estimate)
    {
        if (!_shareable)
        {
            return estimate(parameters).Seconds;
        }

        var key = Key(parameters);
        if (_byShape.TryGetValue(key, out var known) && !double.IsNaN(known))
        {
            return known;
        }

        var (seconds, spec) = estimate(parameters);

        // NaN marks a shape whose points are estimated one by one (a sample with free surfaces or disorder).
        _byShape[key] = spec.Sample.RealSpace is null && !double.IsNaN(seconds) ? seconds : double.NaN;
        return seconds;
    }

    private string Key(PointParameters parameters)
    {
        var columns = parameters.Columns;
        var layout = _layout;
        if (layout is null || !ReferenceEquals(columns, layout.Columns))
        {
            // A plan's points share one array of column names: the columns of the key are found once.
            bool[] flags = [.. columns.Select(c => !_neutral.Contains(c))];
            layout = _layout = new KeyLayout(columns, flags, flags.Contains(true));
        }

        if (!layout.Any)
        {
            return "";
        }

        var inKey = layout.InKey;

        var sb = new StringBuilder();
        for (var i = 0; i < inKey.Length; i++)
        {
            if (inKey[i])
            {
                sb.Append(PointIdentity.Format(parameters.ValueAt(i))).Append('\u0001');
            }
        }

        return sb.ToString();
    }

    /// <summary>Which of a column array's columns make the key (one reference, so threads never see half of it).</summary>
    private sealed record KeyLayout(string[] Columns, bool[] InKey, bool Any);
}
