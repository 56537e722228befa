using System.Collections.Immutable;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>What part of the finished points' summary table to show, sorted how.</summary>
public sealed record SummaryQuery(string? Sort = null, bool Descending = false, int Offset = 0, int Limit = SummaryQuery.DefaultLimit)
{
    public const int DefaultLimit = 100;
    public const int MaxLimit = 5000;
}

/// <summary>A column of the summary table as shown: label and unit in plain words, the dataset's name beside.</summary>
public sealed record SummaryColumn(string Name, string Label, string Description, string Unit, bool IsNumeric, bool IsParameter);

/// <summary>One finished point's row.</summary>
public sealed record SummaryRow(string PointId, ImmutableArray<object?> Values);

/// <summary>A page of the summary table of a sweep's finished points (from its <c>points/</c> Parquet parts).</summary>
public sealed record SummaryTable(
    ImmutableArray<SummaryColumn> Columns,
    ImmutableArray<SummaryRow> Rows,
    int TotalRows,
    string Sort,
    bool Descending,
    int Offset,
    int Limit,
    ImmutableArray<SummaryColumn> SortChoices)
{
    /// <summary>Summary numbers shown by default after the swept parameters (each when the table has it).</summary>
    public static readonly ImmutableArray<string> DefaultColumns =
    [
        "state", "max_freq_thz", "largest_gap_width_thz", "sound_speed_mean_m_per_s", "cv_j_per_mol_k",
        "debye_temperature_from_cv_k", "stable", "duration_s",
    ];

    private const string DefaultSort = "point_index";

    internal static SummaryTable Build(ResultTable points, SweepRecord sweep, SummaryQuery query)
    {
        ArgumentNullException.ThrowIfNull(points);
        ArgumentNullException.ThrowIfNull(query);
        var names = new ColumnCatalog(sweep, TableNames.Points);
        var sort = query.Sort is { } s && points.Has(s) ? s : DefaultSort;
        var shown = names.Parameters
            .Concat(DefaultColumns)
            .Append(points.Numbers(PointCurves.ConductivityColumn).Any(v => v is not null) ? PointCurves.ConductivityColumn : "")
            .Append(sort == DefaultSort ? "" : sort)
            .Where(points.Has)
            .Distinct(StringComparer.Ordinal)
            .ToList();
        var view = shown.Select(n => View(points.Column(n)!, names)).ToImmutableArray();
        var indexes = shown.Select(points.IndexOf).ToArray();
        var idIndex = points.IndexOf("point_id");
        var sortIndex = points.IndexOf(sort);
        var planIndex = points.IndexOf(DefaultSort);
        var inPlanOrder = planIndex < 0 ? points.Rows : [.. points.Rows.OrderBy(r => ResultTable.ToDouble(r[planIndex]) ?? double.MaxValue)];
        var ordered = Order(inPlanOrder, sortIndex, query.Descending);
        var offset = Math.Max(0, query.Offset);
        var limit = Math.Clamp(query.Limit, 1, SummaryQuery.MaxLimit);
        var rows = ordered.Skip(offset).Take(limit)
            .Select(r => new SummaryRow(idIndex >= 0 ? r[idIndex] as string ?? "" : "", [.. indexes.Select(i => r[i])]))
            .ToImmutableArray();
        var choices = points.Columns.Where(c => c.IsNumeric || c.Name == "state").Select(c => View(c, names)).ToImmutableArray();
        return new SummaryTable(view, rows, points.Rows.Length, sort, query.Descending, offset, limit, choices);
    }

    private static SummaryColumn View(ResultColumn c, ColumnCatalog names) =>
        new(c.Name, names.ShortLabel(c.Name), names.Label(c.Name), names.Unit(c), c.IsNumeric, names.IsParameter(c.Name));

    /// <summary>Sorted by one column; empty cells last whichever the direction; ties keep plan order.</summary>
    private static IEnumerable<ImmutableArray<object?>> Order(ImmutableArray<ImmutableArray<object?>> rows, int column, bool descending)
    {
        if (column < 0)
        {
            return rows;
        }

        var present = rows.Where(r => r[column] is not null);
        var sorted = descending
            ? present.OrderByDescending(r => r[column], CellComparer.Instance)
            : present.OrderBy(r => r[column], CellComparer.Instance);
        return sorted.Concat(rows.Where(r => r[column] is null));
    }

    private sealed class CellComparer : IComparer<object?>
    {
        public static readonly CellComparer Instance = new();

        public int Compare(object? x, object? y)
        {
            if (ResultTable.ToDouble(x) is { } a && ResultTable.ToDouble(y) is { } b)
            {
                return a.CompareTo(b);
            }

            return (x, y) switch
            {
                (bool p, bool q) => p.CompareTo(q),
                (DateTimeOffset p, DateTimeOffset q) => p.CompareTo(q),
                _ => string.CompareOrdinal(x?.ToString(), y?.ToString()),
            };
        }
    }
}
