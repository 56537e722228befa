using System.Collections.Immutable;
using System.Text;
using LatticeSweep.Engine.Elastic;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Planning.Cost;
using LatticeSweep.Worker.Planning.Specs;

namespace LatticeSweep.Worker.Planning.Forecast;

/// <summary>
/// What <c>run</c> will meet, found without solving: every point's model is built and pre-flighted
/// by the Engine (the checks it makes before the spectrum), its sample and options checked, and its
/// cost, memory and disk estimated. Models are built once per distinct set of model parameters (a
/// sweep of a million sample sizes over ten models builds ten models); the first <see cref="ModelsKept"/>
/// distinct models are kept for the points that share them, later ones are built for each point that meets
/// them, so the forecast's memory does not grow with the points it checks (every point a model of its own
/// kept ~660 bytes a point: ~100 MB for the ~150,000 points a second checks, which a 10^6-point <c>run</c>
/// then carried into its solving: bench/README.md, round 19). Points are visited in an
/// order spread over the whole plan, so when the time budget (processor time, <see cref="ProcessorClock"/>) runs out the ones evaluated are a fair
/// sample, and the report says so. Each failure reason is traced to where in the job file it comes
/// from by the worker's own <see cref="FailureLocator"/>, so <c>check</c> names the same origin as
/// <c>run</c> and <c>status</c> later, grouped as <c>run</c> groups them (by reason and origin) with the
/// failing values of each group. Each failing point is traced, as <c>run</c> traces each failed point,
/// while tracing has taken less than <see cref="TraceShare"/> of the budget (the first point of each
/// reason always); past that a point is classified by its reason alone and counted into that reason's
/// traced groups in proportion (tracing a refusal costs about ten model checks: tracing every point of
/// a sweep whose every model fails would sample it about ten times thinner).
/// </summary>
internal static class SweepForecast
{
    /// <summary>Time <c>check</c> gives the forecast before it samples.</summary>
    public static readonly TimeSpan DefaultBudget = TimeSpan.FromSeconds(3);

    /// <summary>Models with more branches are not pre-flighted (one eigen-solve would cost more than the check is worth).</summary>
    public const int MaxBranchesPreflighted = 384;

    private const int ExamplesPerReason = 3;

    /// <summary>Wall milliseconds after which the forecast reads its processor clock even between its every-256-points readings.</summary>
    private const long ClockReadEveryMs = 50;

    /// <summary>
    /// Distinct models kept built (a model with its pre-flight is ~660 bytes and more with its basis). A sweep
    /// over fewer models, however many points share them, builds each once; past this many, a point whose
    /// model is not kept builds it again (what a sweep of a model per point does anyway).
    /// </summary>
    internal const int ModelsKept = 4096;

    /// <summary>
    /// The share of the budget that tracing failed points may take. Tracing a refusal costs about ten model
    /// checks; past this share, a failing point is classified by its reason alone and counted into that
    /// reason's traced groups in proportion, so a sweep whose every model fails is still sampled widely.
    /// </summary>
    private const double TraceShare = 0.1;

    /// <summary>
    /// <paramref name="count"/> split in proportion to <paramref name="weights"/> (largest remainders), summing to it.
    /// </summary>
    internal static long[] Apportion(long count, long[] weights)
    {
        var total = weights.Sum();
        var shares = weights.Select(w => total == 0 ? 0 : count * w / total).ToArray();
        var left = count - shares.Sum();
        foreach (var k in Enumerable.Range(0, weights.Length).OrderByDescending(k => total == 0 ? 0 : (count * weights[k]) % total).ThenBy(k => k))
        {
            if (left-- <= 0)
            {
                break;
            }

            shares[k]++;
        }

        return shares;
    }

    /// <summary>One group's points as the forecast traced them: count, first examples, the failing values of its origin's keys.</summary>
    private sealed class GroupTally(SweepPlan plan)
    {
        private const int DistinctCounted = 100_000;

        private List<(AxisInfo Axis, Dictionary<string, (object Value, int Index)> Seen)>? _columns;

        public long Count { get; private set; }

        /// <summary>Points of the reason not traced, counted into this group in proportion.</summary>
        public long Untraced { get; set; }

        public List<PlannedPoint> Examples { get; } = [];

        public void Add(PlannedPoint point, string text)
        {
            Count++;
            if (Examples.Count < ExamplesPerReason)
            {
                Examples.Add(point);
            }

            _columns ??= [.. (Catalog.FailureText.Split(text).Origin?.Keys ?? [])
                .Select(k => plan.Axes.FirstOrDefault(a => a.Path == k.Path))
                .OfType<AxisInfo>()
                .Select(a => (a, new Dictionary<string, (object, int)>(StringComparer.Ordinal)))];
            foreach (var (axis, seen) in _columns)
            {
                if (!point.Parameters.TryGetValue(axis.ColumnName, out var value))
                {
                    continue;
                }

                var key = Catalog.CatalogJson.Show(value);
                if (seen.TryGetValue(key, out var known))
                {
                    seen[key] = (known.Value, Math.Min(known.Index, point.Index));
                }
                else if (seen.Count < DistinctCounted)
                {
                    seen[key] = (value, point.Index);
                }
            }
        }

        /// <summary>The failing values over the traced points, the first in plan order, as run and status show them.</summary>
        public ImmutableArray<Catalog.FailingValues> Values() =>
            [.. (_columns ?? []).Where(c => c.Seen.Count > 0).Select(c =>
            {
                var numbers = c.Seen.Values.Select(v => v.Value).Where(v => v is double or long).Select(v => Convert.ToDouble(v, System.Globalization.CultureInfo.InvariantCulture)).ToList();
                return new Catalog.FailingValues(c.Axis.ColumnName, c.Axis.Path, c.Seen.Count,
                    [.. c.Seen.Values.OrderBy(v => v.Index).Take(Catalog.FailingValues.Listed).Select(v => v.Value)],
                    numbers.Count > 0 ? numbers.Min() : null, numbers.Count > 0 ? numbers.Max() : null, (int)Math.Min(int.MaxValue, c.Axis.ValueCount));
            })];
    }

    private sealed record ModelEntry(CrystalModel? Model, ElasticFitResult? Fit, string? Failure, ModelPreflight? Preflight, ModelException? Refusal = null);

    /// <param name="document">The job file as read: each failure reason then names the file, line and column of the key
    /// it is about (<see cref="JobFiles.ModelProblemText"/>); without it the Engine's reason alone.</param>
    /// <param name="untilOneWorks">Stop at the first point that will not fail (<c>run</c>'s question is only whether every point
    /// fails): the report then counts the points evaluated up to it, and its totals are of those alone.</param>
    public static ForecastReport Run(SweepPlan plan, TimeSpan budget, Func<PointCost.Work, double>? seconds = null, JobFiles.TomlDocument? document = null,
        bool untilOneWorks = false)
    {
        ArgumentNullException.ThrowIfNull(plan);
        seconds ??= PointCost.Seconds;
        var clock = ProcessorClock.StartNew();
        var points = plan.Points;
        var modelColumns = plan.Template.Bindings.Where(b => b.Field.Path.StartsWith("model.", StringComparison.Ordinal)).Select(b => b.Column).ToArray();
        var models = new Dictionary<string, ModelEntry>(StringComparer.Ordinal);

        // Every distinct model met, by a 64-bit hash of its key (8 bytes each instead of the model): for the count and the notes.
        var distinct = new HashSet<ulong>();
        // Groups by the error text run writes (reason and origin), and per located reason the groups its traced points fell in.
        var groups = new Dictionary<string, GroupTally>(StringComparer.Ordinal);
        var traced = new Dictionary<string, List<string>>(StringComparer.Ordinal);
        var untraced = new Dictionary<string, long>(StringComparer.Ordinal);
        var tracing = TimeSpan.Zero;
        var justTraced = false;
        var lastReadTicks = Environment.TickCount64;
        var failed = 0L;
        var evaluated = 0L;
        var totalSeconds = 0.0;
        var diskBytes = 0.0;
        var peakBytes = 0L;
        var aboveLimit = 0L;
        (PlannedPoint Point, double Seconds)? costliest = null;
        (PlannedPoint Point, Vec3 Q)? floppy = null;
        var floppyPoints = 0L;
        (PlannedPoint Point, string Reason)? unlisted = null;
        var unlistedPoints = 0L;
        (PlannedPoint Point, double Residual)? worstFit = null;
        var modelsNotPreflighted = 0;
        var key = new StringBuilder();
        var stride = Stride(points.Length);
        for (long i = 0; i < points.Length; i++)
        {
            // The processor clock is read every 256 points, and also once 50 ms of wall time have passed since the last
            // reading: a point whose bulk long waves are planned (PointCost.BulkPlanOf, up to ~0.4 s per new model) would
            // otherwise run 256 of them past the budget (a layered sweep of a model per point: 43 s of CPU for a 3 s budget).
            var ticks = Environment.TickCount64;
            if (((i & 255) == 0 || justTraced || ticks - lastReadTicks > ClockReadEveryMs) && i > 0)
            {
                lastReadTicks = ticks;
                if (clock.Elapsed > budget)
                {
                    break;
                }
            }

            var point = points[(int)(i * stride % points.Length)];
            evaluated++;
            var spec = PointBinder.Apply(plan.Template, point);
            key.Clear();
            foreach (var column in modelColumns)
            {
                key.Append(point.Parameters.TryGetValue(column, out var v) ? PointIdentity.Format(v) : "-").Append('\u0001');
            }

            var modelKey = key.ToString();
            if (!models.TryGetValue(modelKey, out var entry))
            {
                entry = BuildModel(spec.Model, document);
                if (distinct.Add(KeyHash(modelKey)))
                {
                    modelsNotPreflighted += entry.Model is not null && entry.Preflight is null ? 1 : 0;
                }

                if (models.Count < ModelsKept)
                {
                    models[modelKey] = entry;
                }
            }

            justTraced = false;
            string? failure = entry.Failure;
            var refusal = entry.Refusal;
            if (failure is null)
            {
                try
                {
                    var model = entry.Model!;
                    var sample = EngineObjects.BuildSample(spec.Sample, model.Lattice);
                    var options = plan.Template.Options with { Conductivity = spec.Conductivity };
                    PhononSolver.PreflightPoint(model, sample, options);
                    var s = seconds(PointCost.WorkOf(model, sample, options));
                    totalSeconds += s;
                    if (costliest is null || s > costliest.Value.Seconds)
                    {
                        costliest = (point, s);
                    }

                    aboveLimit += s > plan.WarnPointTimeS ? 1 : 0;
                    peakBytes = Math.Max(peakBytes, PhononSolver.Estimate(model, sample, options).PeakBytes);
                    diskBytes += Commands.CheckCommand.DiskBytes(plan.Outputs, model, sample, options);
                    if (plan.Outputs.Modes && PhononSolver.ModeListGap(model, sample, options) is { } gap)
                    {
                        unlistedPoints++;
                        unlisted ??= (point, gap);
                    }

                    if (entry.Preflight?.ZeroModeAtReducedQ is { } q)
                    {
                        floppyPoints++;
                        floppy ??= (point, q);
                    }

                    if (entry.Fit is { } fit && (worstFit is null || fit.RelativeResidual > worstFit.Value.Residual))
                    {
                        worstFit = (point, fit.RelativeResidual);
                    }
                }
                catch (ModelException ex)
                {
                    failure = JobFiles.ModelProblemText.Of(ex, document);
                    refusal = ex;
                }
            }

            if (failure is null && untilOneWorks)
            {
                break;
            }

            if (failure is not null)
            {
                failed++;
                var first = !traced.ContainsKey(failure);
                if (first || tracing < budget * TraceShare)
                {
                    // Traced point by point, as run traces each failed point, while the tracing's share of the budget lasts;
                    // the first point of each reason always.
                    var tracingFrom = clock.Elapsed;
                    var text = FailureLocator.DescribeOrUntraced(plan, point, refusal!, out _);
                    tracing += clock.Elapsed - tracingFrom;
                    justTraced = true;
                    if (!traced.TryGetValue(failure, out var texts))
                    {
                        texts = [];
                        traced[failure] = texts;
                    }

                    if (!groups.TryGetValue(text, out var group))
                    {
                        group = new GroupTally(plan);
                        groups[text] = group;
                    }

                    // Two located reasons (other lines) may share a traced text: each lists the groups its points fell in.
                    if (!texts.Contains(text, StringComparer.Ordinal))
                    {
                        texts.Add(text);
                    }

                    group.Add(point, text);
                }
                else
                {
                    untraced[failure] = untraced.GetValueOrDefault(failure) + 1;
                }
            }
        }

        // Points of a reason met after the tracing's share ran out join its traced groups in proportion to theirs.
        foreach (var (reason, count) in untraced)
        {
            var texts = traced[reason];
            var tallies = texts.Select(t => groups[t]).ToList();
            var share = Apportion(count, [.. tallies.Select(g => g.Count)]);
            for (var k = 0; k < tallies.Count; k++)
            {
                tallies[k].Untraced += share[k];
            }
        }

        return new ForecastReport
        {
            Total = points.Length,
            Evaluated = evaluated,
            Elapsed = clock.Elapsed,
            Budget = budget,
            DistinctModels = distinct.Count,
            ModelsNotPreflighted = modelsNotPreflighted,
            WillFail = failed,
            Failures = [.. groups.OrderByDescending(f => f.Value.Count + f.Value.Untraced).ThenBy(f => f.Key, StringComparer.Ordinal)
                .Select(f => new FailureForecast(f.Key, f.Value.Count + f.Value.Untraced, [.. f.Value.Examples]) { Traced = f.Value.Count, Values = f.Value.Values() })],
            EvaluatedSeconds = totalSeconds,
            Costliest = costliest is { } c ? new CostlyPoint(c.Point, c.Seconds) : null,
            WarnPointTimeS = plan.WarnPointTimeS,
            AboveWarnLimit = aboveLimit,
            PeakBytes = peakBytes,
            EvaluatedDiskBytes = diskBytes,
            FloppyPoints = floppyPoints,
            FloppyExample = floppy is { } f ? (f.Point, f.Q) : null,
            UnlistedModePoints = unlistedPoints,
            UnlistedModeExample = unlisted,
            WorstElasticFit = worstFit,
        };
    }

    private static ModelEntry BuildModel(ModelSpec spec, JobFiles.TomlDocument? document)
    {
        try
        {
            var model = EngineObjects.BuildModel(spec, out var fit);
            var preflight = model.BranchCount <= MaxBranchesPreflighted ? PhononSolver.PreflightModel(model) : null;
            return new ModelEntry(model, fit, null, preflight);
        }
        catch (ModelException ex)
        {
            return new ModelEntry(null, null, JobFiles.ModelProblemText.Of(ex, document), null, ex);
        }
    }

    /// <summary>FNV-1a over the key's characters (64 bits: two of the ~10^5-10^6 keys a forecast meets share one with odds of ~10^-8).</summary>
    private static ulong KeyHash(string key)
    {
        var hash = 14695981039346656037UL;
        foreach (var c in key)
        {
            hash = (hash ^ c) * 1099511628211UL;
        }

        return hash;
    }

    /// <summary>A step coprime to <paramref name="n"/> near n times the golden ratio's fraction: i * step mod n visits every point once, spread out.</summary>
    internal static long Stride(int n)
    {
        if (n <= 2)
        {
            return 1;
        }

        var step = Math.Max(1L, (long)Math.Round(n * 0.6180339887498949));
        while (Gcd(step, n) != 1)
        {
            step++;
        }

        return step;
    }

    private static long Gcd(long a, long b) => b == 0 ? a : Gcd(b, a % b);
}

/// <summary>Points that will fail for one reason, with the first few; <paramref name="Reason"/> is the error text <c>run</c> writes (<see cref="Catalog.FailureText"/>).</summary>
internal sealed record FailureForecast(string Reason, long Count, ImmutableArray<PlannedPoint> Examples)
{
    /// <summary>Points of the group traced one by one; the rest of <see cref="Count"/> share the reason and were counted in proportion.</summary>
    public long Traced { get; init; }

    /// <summary>The values of the origin's swept keys over the traced points, as <c>run</c> shows them.</summary>
    public ImmutableArray<Catalog.FailingValues> Values { get; init; } = [];

    /// <summary>The reason without its origin.</summary>
    public string ReasonText => Catalog.FailureText.Split(Reason).Reason;

    /// <summary>Where in the job file the reason comes from, as <c>run</c> and <c>status</c> name it.</summary>
    public Catalog.FailureOrigin? Origin => Catalog.FailureText.Split(Reason).Origin;
}

/// <summary>The point estimated to take longest.</summary>
internal sealed record CostlyPoint(PlannedPoint Point, double Seconds);

/// <summary>What <see cref="SweepForecast"/> found.</summary>
internal sealed record ForecastReport
{
    public required long Total { get; init; }
    public required long Evaluated { get; init; }
    public required TimeSpan Elapsed { get; init; }
    public required TimeSpan Budget { get; init; }
    public required int DistinctModels { get; init; }
    public required int ModelsNotPreflighted { get; init; }
    public required long WillFail { get; init; }
    public required ImmutableArray<FailureForecast> Failures { get; init; }

    /// <summary>Summed single-core seconds of the evaluated points that will run.</summary>
    public required double EvaluatedSeconds { get; init; }
    public required CostlyPoint? Costliest { get; init; }
    public required double WarnPointTimeS { get; init; }
    public required long AboveWarnLimit { get; init; }
    public required long PeakBytes { get; init; }
    public required double EvaluatedDiskBytes { get; init; }
    public required long FloppyPoints { get; init; }
    public required (PlannedPoint Point, Vec3 Q)? FloppyExample { get; init; }

    /// <summary>Finite points whose <c>modes</c> rows will stay empty, and the first with its reason.</summary>
    public long UnlistedModePoints { get; init; }

    public (PlannedPoint Point, string Reason)? UnlistedModeExample { get; init; }
    public required (PlannedPoint Point, double Residual)? WorstElasticFit { get; init; }

    /// <summary>True when the budget ran out before every point was evaluated.</summary>
    public bool Sampled => Evaluated < Total;

    /// <summary>Every evaluated point will fail.</summary>
    public bool AllFail => Evaluated > 0 && WillFail == Evaluated;

    /// <summary>Evaluated figures scaled to the whole plan (1 when every point was evaluated).</summary>
    public double Scale => Evaluated == 0 ? 0 : (double)Total / Evaluated;
}
