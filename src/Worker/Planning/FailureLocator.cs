using System.Runtime.CompilerServices;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning.Forecast;
using LatticeSweep.Worker.Planning.Specs;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// A failed point's error text with where in the job file it comes from (<see cref="FailureText"/>).
/// A model failure is traced by the Engine's checks before the spectrum (the ones <c>check</c>
/// runs): the point is checked again with each swept key in turn put back to the job file's own
/// value; a key whose put-back clears the reason is one it comes from. When none alone does but all
/// together do, the keys together; when the job file's own values fail too, the reason names their
/// lines as <c>check</c> does. When the checks pass (the failure came later in the solve) or the
/// model is too large for them, a swept key whose path is the Engine's key (or a part of it) is
/// named; otherwise the failure is said to be untraced. A failure inside the solver is never given a
/// location. Runs only for failed points: the path of a point that solves is untouched.
/// </summary>
internal static class FailureLocator
{
    private static readonly ConditionalWeakTable<SweepPlan, TomlDocument?> Documents = [];

    /// <summary>The error text of a point the Engine refused with <paramref name="ex"/>.</summary>
    public static string Describe(SweepPlan plan, PlannedPoint point, ModelException ex)
    {
        ArgumentNullException.ThrowIfNull(plan);
        ArgumentNullException.ThrowIfNull(point);
        ArgumentNullException.ThrowIfNull(ex);
        var swept = plan.SweptKeys.Where(k => point.Parameters.ContainsKey(k.Column)).ToList();
        var reason = PlainReason(ex);
        if (swept.Count == 0)
        {
            return FailureText.Compose(LocatedReason(plan, ex), FailureOrigin.JobFile);
        }

        var original = CheckFailure(plan, point.Parameters, _ => false);
        if (original is null)
        {
            var keys = ex.Problems.Select(p => ModelProblemText.JobFileKey(p.Where)).ToList();
            var named = swept.Where(k => keys.Any(k.Touches)).ToList();
            return named.Count > 0
                ? FailureText.Compose(reason, Origin(FailureOriginKind.SweptValue, named, plan))
                : FailureText.Compose(LocatedReason(plan, ex), FailureOrigin.Untraced);
        }

        var alone = swept.Where(k => CheckFailure(plan, point.Parameters, c => c == k.Column) != original).ToList();
        if (alone.Count > 0)
        {
            return FailureText.Compose(reason, Origin(FailureOriginKind.SweptValue, alone, plan));
        }

        if (swept.Count > 1 && CheckFailure(plan, point.Parameters, _ => true) != original)
        {
            return FailureText.Compose(reason, Origin(FailureOriginKind.SweptTogether, swept, plan));
        }

        return FailureText.Compose(LocatedReason(plan, ex), FailureOrigin.JobFile);
    }

    /// <summary>The error text of a point that failed inside the solver (not the user's input).</summary>
    public static string DescribeSolverFailure(string reason) => FailureText.Compose(reason, FailureOrigin.Solver);

    private static FailureOrigin Origin(FailureOriginKind kind, IEnumerable<SweptKey> keys, SweepPlan plan) =>
        new(kind, [.. keys.Select(k => new OriginKey(k.Path, k.Location(plan.SourcePath)))]);

    /// <summary>Each problem at its job-file key, on one line (the location is the origin's).</summary>
    private static string PlainReason(ModelException ex) =>
        ex.Problems.Count == 0
            ? ex.Message.ReplaceLineEndings("; ")
            : string.Join("; ", ex.Problems.Select(p => $"{ModelProblemText.JobFileKey(p.Where)}: {p.Message}"));

    /// <summary>Each problem at its line in the job file, as <c>check</c> reports it.</summary>
    private static string LocatedReason(SweepPlan plan, ModelException ex) => ModelProblemText.Of(ex, Document(plan));

    private static TomlDocument? Document(SweepPlan plan) =>
        Documents.GetValue(plan, p => TomlDocument.Parse(p.SpecText, p.SourcePath, new ProblemCollector(p.SourcePath)));

    /// <summary>
    /// What the Engine's checks refuse the point for before its spectrum, as the kinds and keys of its
    /// problems (null when it passes, or when its model is too large to check). Kinds and keys, not the
    /// words: a floppy model's message names the first free direction it finds, which other values may change.
    /// </summary>
    private static string? CheckFailure(SweepPlan plan, PointParameters parameters, Func<string, bool> keepBase)
    {
        try
        {
            var spec = PointBinder.Apply(plan.Template, parameters, keepBase);
            if (SpecChecks.Check(spec) is { } wrong)
            {
                return wrong;
            }

            var model = EngineObjects.BuildModel(spec.Model, out _);
            if (model.BranchCount > SweepForecast.MaxBranchesPreflighted)
            {
                return null;
            }

            PhononSolver.PreflightModel(model);
            var sample = EngineObjects.BuildSample(spec.Sample, model.Lattice);
            PhononSolver.PreflightPoint(model, sample, plan.Template.Options with { Conductivity = spec.Conductivity });
            return null;
        }
        catch (ModelException ex)
        {
            return ex.Problems.Count == 0 ? ex.Message : string.Join("\n", ex.Problems.Select(p => $"{p.Kind} {p.Where}"));
        }
    }
}
