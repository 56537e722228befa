using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>Plain-words labels and units of a sweep's result columns, taken from the Worker's schemas.</summary>
internal sealed class ColumnCatalog
{
    private const string SweptPrefix = "swept parameter ";

    private readonly Dictionary<string, ColumnDef> _defs = new(StringComparer.Ordinal);

    public ColumnCatalog(SweepRecord sweep, string table)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        foreach (var def in new ResultSchemas(sweep.Axes).ColumnsOf(table))
        {
            _defs[def.Name] = def;
        }

        Parameters = [.. _defs.Values.Where(d => d.Description.StartsWith(SweptPrefix, StringComparison.Ordinal)).Select(d => d.Name)];
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

        var text = def.Description.StartsWith(SweptPrefix, StringComparison.Ordinal) ? def.Description[SweptPrefix.Length..] : def.Description;
        return text.Length == 0 ? column : char.ToUpperInvariant(text[0]) + text[1..];
    }

    /// <summary>The unit from the file when it says, else from the schema.</summary>
    public string Unit(ResultColumn column)
    {
        ArgumentNullException.ThrowIfNull(column);
        return column.Unit.Length > 0 ? column.Unit : _defs.TryGetValue(column.Name, out var d) ? d.Unit : "";
    }
}
