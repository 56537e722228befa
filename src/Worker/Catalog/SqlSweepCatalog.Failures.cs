using System.Collections.Immutable;
using System.Data.Common;
using System.Globalization;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// Failed points by reason, grouped in the store: a sweep with a million failed points costs a
/// grouping query over the failed rows' index (<see cref="FailedIndexStatement"/>), a few ids per group
/// and one pass over a group's rows per traced key for its failing values; no failed row is carried
/// into this process, so memory does not grow with the failures. A group's points are read a page at
/// a time (<see cref="GetPoints"/> with <see cref="PointQuery.Error"/>).
/// </summary>
public abstract partial class SqlSweepCatalog
{
    /// <summary>
    /// Groups given their first ids and failing values at most (the rest, counted, have none): the largest first.
    /// Kept above the dashboard's 50 listed groups (which need them all) rather than bound per caller: `status`
    /// (20 entries) and `run` (5) put failing candidates' groups together, an entry's examples coming from
    /// groups further down the list, and detailing 100 small groups cost nothing measurable
    /// (bench/README.md, Round 17 (candidate rows): `status` of 2,000 groups as fast as of one).
    /// </summary>
    public const int DetailedFailureGroups = 100;

    /// <summary>Distinct values counted per key column at most (a group of a million failures stays small).</summary>
    public const int DistinctFailingValuesCounted = 100_000;

    private const int ExamplesPerGroup = 5;

    /// <summary>
    /// The failed rows of a sweep indexed by error text, kind and plan order (only failed rows: a
    /// point that solves writes nothing more). A literal <c>state = 'failed'</c>, which the queries
    /// below repeat as it is, so both databases see that the partial index serves them.
    /// </summary>
    protected virtual string FailedIndexStatement =>
        "CREATE INDEX IF NOT EXISTS latsweep_points_failed ON latsweep_points (sweep_id, error, failure_kind, point_index) WHERE state = 'failed'";

    /// <summary>The SQL the failed index keys the error by (PostgreSQL: a hash, since a long text would not fit a B-tree entry).</summary>
    protected virtual string ErrorKey(string expression) => expression;

    /// <summary>SQL for the JSON text of one parameter of <c>parameters_json</c>, <paramref name="pathParameter"/> being <c>$."column"</c>.</summary>
    protected virtual string ParameterJson(string pathParameter) => $"(parameters_json -> {pathParameter})";

    /// <summary>The value of <paramref name="pathParameter"/> for a column: <c>$."column"</c> (SQLite's JSON path; PostgreSQL takes the name).</summary>
    protected virtual string ParameterPath(string column) => "$.\"" + column.Replace("\"", "\\\"", StringComparison.Ordinal) + "\"";

    private const string FailedRows = "sweep_id = @sweep AND state = 'failed'";

    private string GroupRows => $"{FailedRows} AND {ErrorKey("error")} = {ErrorKey("@error")} AND error = @error AND failure_kind = @kind";

    public IReadOnlyList<FailureGroup> GetFailureGroups(string sweepId) => FailureGroups(sweepId, null);

    public FailureGroup? GetFailureGroup(string sweepId, string key)
    {
        ArgumentNullException.ThrowIfNull(key);
        return FailureGroups(sweepId, key).FirstOrDefault();
    }

    /// <summary>Every group (the largest <see cref="DetailedFailureGroups"/> detailed), or only the one with <paramref name="onlyKey"/>.</summary>
    private List<FailureGroup> FailureGroups(string sweepId, string? onlyKey)
    {
        using var c = Open();
        using var tx = BeginRead(c);
        var axes = ReadAxes(c, tx, sweepId);
        var counted = new List<(FailureKind Kind, string KindText, string Error, long Count)>();
        using (var cmd = Command(c, tx, $"SELECT failure_kind, error, count(*) FROM latsweep_points WHERE {FailedRows} GROUP BY error, failure_kind"))
        {
            Add(cmd, "sweep", sweepId);
            using var r = cmd.ExecuteReader();
            while (r.Read())
            {
                var kindText = r.IsDBNull(0) ? null : r.GetString(0);
                counted.Add((kindText is null ? FailureKind.Engine : ParseFailureKind(kindText), kindText ?? "", r.IsDBNull(1) ? "" : r.GetString(1), r.GetInt64(2)));
            }
        }

        var ordered = counted.OrderByDescending(g => g.Count).ThenBy(g => g.Error, StringComparer.Ordinal)
            .Where(g => onlyKey is null || FailureGroup.KeyOf(g.Kind, g.Error) == onlyKey).ToList();
        var groups = new List<FailureGroup>(ordered.Count);
        for (var i = 0; i < ordered.Count; i++)
        {
            var (kind, kindText, error, count) = ordered[i];
            if (i >= DetailedFailureGroups || kindText.Length == 0)
            {
                groups.Add(new FailureGroup(kind, error, count, []));
                continue;
            }

            var examples = GroupPointIds(c, tx, sweepId, kindText, error, ExamplesPerGroup);
            var values = FailureText.Split(error).Origin?.Keys
                .Select(k => axes.FirstOrDefault(a => a.Path == k.Path))
                .OfType<AxisInfo>()
                .Select(axis => GroupValues(c, tx, sweepId, kindText, error, count, axis))
                .OfType<FailingValues>()
                .ToImmutableArray() ?? [];
            groups.Add(new FailureGroup(kind, error, count, examples) { Values = values });
        }

        return groups;
    }

    private ImmutableArray<string> GroupPointIds(DbConnection c, DbTransaction tx, string sweepId, string kind, string error, int limit)
    {
        using var cmd = Command(c, tx, $"SELECT point_id FROM latsweep_points WHERE {GroupRows} ORDER BY point_index LIMIT @limit");
        AddGroup(cmd, sweepId, kind, error);
        Add(cmd, "limit", (long)limit);
        using var r = cmd.ExecuteReader();
        var ids = ImmutableArray.CreateBuilder<string>();
        while (r.Read())
        {
            ids.Add(r.GetString(0));
        }

        return ids.ToImmutable();
    }

    /// <summary>
    /// Failing values kept per (sweep, group, its count, column): a group whose count has not changed has the same
    /// points (failed points are only added; a resumed point leaves its group first), so a page shown again, or the
    /// sweep page's refresh every few seconds, does not read a large group's rows again.
    /// </summary>
    private readonly System.Collections.Concurrent.ConcurrentDictionary<string, FailingValues?> _failingValues = new(StringComparer.Ordinal);

    private const int FailingValuesKept = 1024;

    private FailingValues? GroupValues(DbConnection c, DbTransaction tx, string sweepId, string kind, string error, long count, AxisInfo axis)
    {
        var key = string.Join('\u0001', sweepId, kind, error, count.ToString(CultureInfo.InvariantCulture), axis.ColumnName);
        if (_failingValues.TryGetValue(key, out var known))
        {
            return known;
        }

        var values = ReadGroupValues(c, tx, sweepId, kind, error, axis);
        if (_failingValues.Count >= FailingValuesKept)
        {
            _failingValues.Clear();
        }

        _failingValues[key] = values;
        return values;
    }

    /// <summary>The distinct values of one swept column over a group's points, each with its first point in plan order; null when none has it.</summary>
    private FailingValues? ReadGroupValues(DbConnection c, DbTransaction tx, string sweepId, string kind, string error, AxisInfo axis)
    {
        using var cmd = Command(c, tx, $"""
            SELECT v, min(point_index) AS first FROM (SELECT {ParameterJson("@path")} AS v, point_index FROM latsweep_points WHERE {GroupRows}) AS g
            WHERE v IS NOT NULL GROUP BY v ORDER BY first LIMIT @limit
            """);
        AddGroup(cmd, sweepId, kind, error);
        Add(cmd, "path", ParameterPath(axis.ColumnName));
        Add(cmd, "limit", (long)DistinctFailingValuesCounted);
        var first = new List<object>();
        long distinct = 0;
        double min = double.PositiveInfinity, max = double.NegativeInfinity;
        using (var r = cmd.ExecuteReader())
        {
            while (r.Read())
            {
                if (ReadJsonValue(r.GetValue(0), axis.ValueType) is not { } value)
                {
                    continue;
                }

                distinct++;
                if (first.Count < FailingValues.Listed)
                {
                    first.Add(value);
                }

                if (value is double or long)
                {
                    var d = Convert.ToDouble(value, CultureInfo.InvariantCulture);
                    min = Math.Min(min, d);
                    max = Math.Max(max, d);
                }
            }
        }

        return distinct == 0
            ? null
            : new FailingValues(axis.ColumnName, axis.Path, distinct, [.. first], double.IsFinite(min) ? min : null, double.IsFinite(max) ? max : null, (int)Math.Min(int.MaxValue, axis.ValueCount));
    }

    /// <summary>A parameter's JSON text (or, from a driver that hands back the value itself, that value) typed as its axis.</summary>
    private static object? ReadJsonValue(object raw, AxisValueType type)
    {
        var json = raw switch
        {
            string text => text,
            byte[] bytes => System.Text.Encoding.UTF8.GetString(bytes),
            _ => Convert.ToString(raw, CultureInfo.InvariantCulture) ?? "null",
        };
        return CatalogJson.ReadValue(json, type);
    }

    private static void AddGroup(DbCommand cmd, string sweepId, string kind, string error)
    {
        Add(cmd, "sweep", sweepId);
        Add(cmd, "error", error);
        Add(cmd, "kind", kind);
    }
}
