using System.Collections.Concurrent;
using System.Runtime.CompilerServices;
using LatticeSweep.Engine.Models;
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
/// value, then with it set to a few other values the sweep gives it; the keys whose change lets the
/// point pass are the ones it comes from. When no change lets it pass (another check would fail
/// first), the keys whose change removes this reason (its problems' kinds and keys); when none does
/// but all put back together let it pass, the keys together (those of them that fail alone on the
/// job file's own values). Otherwise the job file's own
/// values fail too, and the reason names their lines as <c>check</c> does. When the checks pass (the failure came later in the solve), a swept key whose path is the Engine's key (or a part of it) is
/// named; otherwise the failure is said to be untraced. A failure inside the solver is never given a
/// location. Runs only for failed points: the path of a point that solves is untouched. A refusal
/// of the model itself is traced on the model's checks alone, once per reason and set of swept model
/// values in a process (a sweep of a bad model over a thousand sample sizes traces it once).
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

        var original = Check(plan, point.Parameters, _ => false);
        if (original is not { Passes: false })
        {
            var keys = ex.Problems.Select(p => ModelProblemText.JobFileKey(p.Where)).ToList();
            var named = swept.Where(k => keys.Any(k.Touches)).ToList();
            return named.Count > 0
                ? FailureText.Compose(reason, Origin(FailureOriginKind.SweptValue, named, plan, point))
                : FailureText.Compose(LocatedReason(plan, ex), FailureOrigin.Untraced);
        }

        // A refusal of the model itself cannot come from the sample's keys, and is the same for every point
        // with the same model values: traced once per reason and model (a sweep of sizes traces each bad model once).
        var (kind, traced) = original.OfModel
            ? Traced.GetValue(plan, _ => new ConcurrentDictionary<string, (FailureOriginKind, List<SweptKey>)>(StringComparer.Ordinal))
                .GetOrAdd(MemoKey(original, point.Parameters, swept.Where(IsModelKey)), _ => Trace(plan, point.Parameters, [.. swept.Where(IsModelKey)], original))
            : Trace(plan, point.Parameters, swept, original);
        return kind == FailureOriginKind.JobFileValue
            ? FailureText.Compose(LocatedReason(plan, ex), FailureOrigin.JobFile)
            : FailureText.Compose(reason, Origin(kind, traced, plan, point));
    }

    private static readonly ConditionalWeakTable<SweepPlan, ConcurrentDictionary<string, (FailureOriginKind, List<SweptKey>)>> Traced = [];

    private static bool IsModelKey(SweptKey key) => key.Path.StartsWith("model.", StringComparison.Ordinal);

    private static string MemoKey(CheckResult original, PointParameters parameters, IEnumerable<SweptKey> keys) =>
        string.Join("\u0001", original.Problems.Order(StringComparer.Ordinal)) + "\u0002"
        + string.Join("\u0001", keys.Select(k => PointIdentity.Format(parameters[k.Column])));

    /// <summary>The swept keys the point's refusal comes from, among <paramref name="swept"/>, and how.</summary>
    private static (FailureOriginKind Kind, List<SweptKey> Keys) Trace(SweepPlan plan, PointParameters parameters, List<SweptKey> swept, CheckResult original)
    {
        if (swept.Count == 0)
        {
            return (FailureOriginKind.JobFileValue, []);
        }

        var tried = swept.ToDictionary(k => k, k => Alternatives(plan, parameters, k).Select(a => Check(plan, a.Parameters, a.KeepBase, original.OfModel)).ToList());
        var letPass = swept.Where(k => tried[k].Any(r => r is { Passes: true })).ToList();
        if (letPass.Count > 0)
        {
            return (FailureOriginKind.SweptValue, letPass);
        }

        // No change lets the point pass (another check fails first): keys whose change removes this reason.
        var removeIt = swept.Where(k => tried[k].Any(r => r is { Passes: false } && !original.Problems.IsSubsetOf(r.Problems))).ToList();
        if (removeIt.Count > 0)
        {
            return (FailureOriginKind.SweptValue, removeIt);
        }

        var columns = swept.Select(k => k.Column).ToHashSet(StringComparer.Ordinal);
        if (swept.Count > 1 && Check(plan, parameters, columns.Contains, original.OfModel) is { Passes: true })
        {
            // Of those, the keys it needs: with the others put back and this one kept, the point still fails.
            var needed = swept.Where(k => Check(plan, parameters, c => c != k.Column && columns.Contains(c), original.OfModel) is { Passes: false }).ToList();
            return (FailureOriginKind.SweptTogether, needed.Count > 0 ? needed : swept);
        }

        return (FailureOriginKind.JobFileValue, []);
    }

    /// <summary>Other values tried per swept key besides the job file's own: the sweep's first few values other than the point's.</summary>
    private const int OtherValuesTried = 3;

    /// <summary>
    /// The point with one key changed: put back to the job file's own value, then set to a few other
    /// values the sweep gives it (the job file's own may fail as well, say a spring of 0 swept over 0 and 8).
    /// </summary>
    private static IEnumerable<(PointParameters Parameters, Func<string, bool> KeepBase)> Alternatives(SweepPlan plan, PointParameters parameters, SweptKey key)
    {
        yield return (parameters, c => c == key.Column);
        var own = parameters[key.Column];
        var axis = plan.Axes.FirstOrDefault(a => a.ColumnName == key.Column);
        foreach (var value in (axis?.SomeValues() ?? []).Where(v => !Equals(v, own)).Take(OtherValuesTried))
        {
            yield return (parameters.With(key.Column, value), _ => false);
        }
    }

    /// <summary>
    /// <see cref="Describe"/>, or when tracing itself fails, the Engine's reason marked untraced with the fault in
    /// <paramref name="fault"/>: a fault in tracing must not lose a point's outcome nor stop <c>check</c>.
    /// </summary>
    public static string DescribeOrUntraced(SweepPlan plan, PlannedPoint point, ModelException ex, out Exception? fault)
    {
        try
        {
            fault = null;
            return Describe(plan, point, ex);
        }
        catch (Exception traceFault) when (traceFault is not OutOfMemoryException and not OperationCanceledException)
        {
            fault = traceFault;
            return FailureText.Compose(ex.Message.ReplaceLineEndings("; "), FailureOrigin.Untraced);
        }
    }

    /// <summary>The error text of a point that failed inside the solver (not the user's input).</summary>
    public static string DescribeSolverFailure(string reason) => FailureText.Compose(reason, FailureOrigin.Solver);

    /// <summary>
    /// The keys with their places: a candidates column at the point's row in the candidates file (what a user edits),
    /// the same for every key of that row; the column's mapping line in the job file only when the row is unknown.
    /// </summary>
    private static FailureOrigin Origin(FailureOriginKind kind, IEnumerable<SweptKey> keys, SweepPlan plan, PlannedPoint point)
    {
        var row = keys.Any(k => k.CandidateColumn is not null) ? plan.CandidateRowOf(point) : null;
        return new(kind, [.. keys.OrderBy(k => k.CandidateColumn is null).Select(k => row is not null && k.CandidateColumn is { } column
            ? new OriginKey(k.Path, row, column)
            : new OriginKey(k.Path, k.Location(plan.SourcePath)))]);
    }

    /// <summary>Each problem at its job-file key, on one line (the location is the origin's).</summary>
    private static string PlainReason(ModelException ex) =>
        ex.Problems.Count == 0
            ? ex.Message.ReplaceLineEndings("; ")
            : string.Join("; ", ex.Problems.Select(p => $"{ModelProblemText.JobFileKey(p.Where)}: {p.Message}"));

    /// <summary>Each problem at its line in the job file, as <c>check</c> reports it.</summary>
    private static string LocatedReason(SweepPlan plan, ModelException ex) => ModelProblemText.Of(ex, Document(plan));

    private static TomlDocument? Document(SweepPlan plan) =>
        Documents.GetValue(plan, p => TomlDocument.Parse(p.SpecText, p.SourcePath, new ProblemCollector(p.SourcePath)));

    /// <summary>What the Engine's checks before the spectrum say of a point: it passes, or the kinds and keys of its problems.</summary>
    /// <param name="OfModel">The model itself was refused (built and checked before any sample), so no sample key can change it.</param>
    private sealed record CheckResult(bool Passes, IReadOnlySet<string> Problems, bool OfModel = false);

    private static readonly CheckResult Passed = new(true, new HashSet<string>());

    /// <summary>The point checked as <c>check</c> and the solver check it before the spectrum.</summary>
    /// <param name="modelOnly">Only the model's checks: a refusal of the model is traced the same whatever the sample.</param>
    private static CheckResult? Check(SweepPlan plan, PointParameters parameters, Func<string, bool> keepBase, bool modelOnly = false)
    {
        var spec = PointBinder.Apply(plan.Template, parameters, keepBase);
        if (!modelOnly && SpecChecks.Check(spec) is { } wrong)
        {
            return new CheckResult(false, new HashSet<string>(StringComparer.Ordinal) { wrong });
        }

        var stage = ModelStageOf(plan, parameters, keepBase, spec.Model);
        if (stage.Refusal is { } refused)
        {
            return refused;
        }

        if (modelOnly)
        {
            return Passed;
        }

        try
        {
            var sample = EngineObjects.BuildSample(spec.Sample, stage.Model!.Lattice);
            PhononSolver.PreflightPoint(stage.Model, sample, plan.Template.Options with { Conductivity = spec.Conductivity });
            return Passed;
        }
        catch (ModelException ex)
        {
            return Refused(ex, ofModel: false);
        }
    }

    /// <summary>A model built and checked before any sample: the model, or its refusal.</summary>
    private sealed record ModelStage(CrystalModel? Model, CheckResult? Refusal);

    /// <summary>Models kept per plan at most (then the memo starts again): a sweep of many bad models stays bounded.</summary>
    private const int ModelStagesKept = 256;

    private static readonly ConditionalWeakTable<SweepPlan, ConcurrentDictionary<string, ModelStage>> ModelStages = [];

    /// <summary>
    /// The model's checks (build, <c>PreflightModel</c>) once per distinct set of <c>model.*</c> values a trace
    /// tries: tracing a point tries each swept key at a few values, and the points of one sweep try the same
    /// models again and again (a refusal of the sample traced point by point would build them every time).
    /// Every size is checked, as the solver checks it: tracing runs for failed points only, so a model above
    /// the forecast's 384 branches costs a few of its own refusals, once per model.
    /// </summary>
    private static ModelStage ModelStageOf(SweepPlan plan, PointParameters parameters, Func<string, bool> keepBase, ModelSpec spec)
    {
        var key = new System.Text.StringBuilder();
        foreach (var binding in plan.Template.Bindings)
        {
            if (binding.Field.Path.StartsWith("model.", StringComparison.Ordinal))
            {
                key.Append(keepBase(binding.Column) || !parameters.TryGetValue(binding.Column, out var v) ? "\u0002" : PointIdentity.Format(v)).Append('\u0001');
            }
        }

        var stages = ModelStages.GetValue(plan, _ => new ConcurrentDictionary<string, ModelStage>(StringComparer.Ordinal));
        if (stages.TryGetValue(key.ToString(), out var known))
        {
            return known;
        }

        ModelStage stage;
        try
        {
            var model = EngineObjects.BuildModel(spec, out _);
            PhononSolver.PreflightModel(model);
            stage = new ModelStage(model, null);
        }
        catch (ModelException ex)
        {
            stage = new ModelStage(null, Refused(ex, ofModel: true));
        }

        if (stages.Count >= ModelStagesKept)
        {
            stages.Clear();
        }

        stages[key.ToString()] = stage;
        return stage;
    }

    // Kinds and keys, not the words: a floppy model's message names the first free direction found, which other values may change.
    private static CheckResult Refused(ModelException ex, bool ofModel) =>
        new(false, ex.Problems.Count == 0
            ? new HashSet<string>(StringComparer.Ordinal) { ex.Message }
            : ex.Problems.Select(p => $"{p.Kind} {p.Where}").ToHashSet(StringComparer.Ordinal), ofModel);
}
