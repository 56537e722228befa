using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>A column of a table in view as the shared rules compare cells (<see cref="PlotDefaults"/>: which parameter determines which, distinct counts).</summary>
internal sealed class RuleCells(ColumnView cells, bool numeric) : IRuleCells
{
    public static RuleCells Of(ResultTable t, int column) => new(t.Cells(column), t.Columns[column].IsNumeric);

    public bool Numeric => numeric;

    public long NumberBits(int row) => cells.Number(row) is { } v ? BitConverter.DoubleToInt64Bits(v) : RuleKey.EmptyBits;

    public RuleKey Key(int row)
    {
        if (numeric)
        {
            return cells.HasValue(row) ? new(NumberBits(row), null) : RuleKey.Empty;
        }

        // Text, flags and times: one kind per column, so the cell key's bits or text tell values apart.
        var key = cells.Key(row);
        return key == CellKey.Empty ? RuleKey.Empty : new(key.Bits, key.Text);
    }
}
