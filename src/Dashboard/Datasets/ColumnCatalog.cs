using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>Plain-words labels and units of a sweep's result columns, taken from the Worker's schemas.</summary>
internal sealed class ColumnCatalog
{
    private const string SweptPrefix = "swept parameter ";

    /// <summary>Short headers for the summary table's usual columns; the full description goes in the tooltip.</summary>
    private static readonly Dictionary<string, string> Short = new(StringComparer.Ordinal)
    {
        ["point_index"] = "Plan position",
        ["state"] = "State",
        ["max_freq_thz"] = "Highest frequency",
        ["min_freq_thz"] = "Lowest frequency",
        ["largest_gap_width_thz"] = "Widest gap",
        ["largest_gap_lower_thz"] = "Widest gap from",
        ["largest_gap_upper_thz"] = "Widest gap to",
        ["gap_count"] = "Gaps",
        ["sound_speed_min_m_per_s"] = "Slowest sound",
        ["sound_speed_mean_m_per_s"] = "Mean sound speed",
        ["sound_speed_max_m_per_s"] = "Fastest sound",
        ["reference_temperature_k"] = "Reference T",
        ["cv_j_per_mol_k"] = "Cv at reference T",
        ["cv_j_per_kg_k"] = "Cv at reference T",
        ["entropy_j_per_mol_k"] = "Entropy at reference T",
        ["debye_temperature_from_cv_k"] = "Debye T from Cv",
        ["kappa_w_per_m_k"] = "Conductivity at reference T",
        ["stable"] = "Stable",
        ["floppy"] = "Floppy",
        ["duration_s"] = "Time taken",
        ["worst_q_reduced_x"] = "Worst unstable q (reduced), x",
        ["worst_q_reduced_y"] = "Worst unstable q (reduced), y",
        ["worst_q_reduced_z"] = "Worst unstable q (reduced), z",
    };

    /// <summary>A description longer than this makes a table header taller than the rows under it.</summary>
    private const int MaxHeaderLength = 28;

    private readonly Dictionary<string, ColumnDef> _defs = new(StringComparer.Ordinal);
    private readonly HashSet<string> _shared;

    public ColumnCatalog(SweepRecord sweep, string table)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        foreach (var def in new ResultSchemas(sweep.Axes).ColumnsOf(table))
        {
            _defs[def.Name] = def;
        }

        Parameters = [.. _defs.Values.Where(d => d.Description.StartsWith(SweptPrefix, StringComparison.Ordinal)).Select(d => d.Name)];
        // Columns that share a description (x, y, z of one vector) get their name beside it, so a list never shows one label twice.
        _shared = [.. _defs.Values.GroupBy(d => d.Description, StringComparer.Ordinal).Where(g => g.Count() > 1).SelectMany(g => g.Select(d => d.Name))];
    }

    /// <summary>Column names of the swept parameters, in axis order.</summary>
    public IReadOnlyList<string> Parameters { get; }

    public bool IsParameter(string column) => Parameters.Contains(column);

    /// <summary>"Highest frequency"; a swept parameter reads as its path; an unknown column as its name.</summary>
    public string Label(string column)
    {
        if (!_defs.TryGetValue(column, out var def))
        {
            return column.Replace('_', ' ');
        }

        if (def.Description.StartsWith(SweptPrefix, StringComparison.Ordinal))
        {
            return def.Description[SweptPrefix.Length..];
        }

        var text = def.Description;
        var label = text.Length == 0 ? column : char.ToUpperInvariant(text[0]) + text[1..];
        return _shared.Contains(column) ? $"{label} ({column})" : label;
    }

    /// <summary>
    /// A header short enough for a table column: the usual ones by name; a swept parameter as its
    /// path without the <c>model.</c>/<c>output.</c> prefix (the unit goes under the header).
    /// </summary>
    public string ShortLabel(string column)
    {
        if (Short.TryGetValue(column, out var s))
        {
            return s;
        }

        if (IsParameter(column))
        {
            var path = Label(column);
            foreach (var prefix in (string[])["model.", "output."])
            {
                if (path.StartsWith(prefix, StringComparison.Ordinal))
                {
                    return path[prefix.Length..];
                }
            }

            return path;
        }

        return Label(column);
    }

    /// <summary>
    /// A table header: the short label of a usual column or a swept parameter, a description that
    /// fits a narrow column, else the column's own name (as a data tool knows it); the full
    /// description goes in the tooltip.
    /// </summary>
    public string HeaderLabel(string column) =>
        Short.ContainsKey(column) || IsParameter(column) || Label(column).Length <= MaxHeaderLength ? ShortLabel(column) : column;

    /// <summary>The unit of a column from the schema ("" when unknown or dimensionless).</summary>
    public string UnitOf(string column) => _defs.TryGetValue(column, out var d) ? Formatting.Show.Unit(d.Unit) : "";

    /// <summary>The unit as the dataset writes it (the file's, else the schema's; "1" for a dimensionless number).</summary>
    public string RawUnit(ResultColumn column)
    {
        ArgumentNullException.ThrowIfNull(column);
        return column.Unit.Length > 0 ? column.Unit : _defs.TryGetValue(column.Name, out var d) ? d.Unit : "";
    }

    /// <summary>The unit from the file when it says, else from the schema; "" for a dimensionless column (unit "1").</summary>
    public string Unit(ResultColumn column)
    {
        ArgumentNullException.ThrowIfNull(column);
        return Formatting.Show.Unit(RawUnit(column));
    }
}
