using LatticeSweep.Worker.JobFiles;

namespace LatticeSweep.Worker.Planning.Expansion;

/// <summary>
/// The expansion of <see cref="SweepExpansion.Expand"/> read by position instead of enumerated:
/// point k's values are worked out from k (candidate row outermost, then the grid's mixed-radix
/// digits with the last axis fastest, the zipped position, or row k of the drawn sample), so a
/// plan of millions of points holds its axes and no object per point.
/// </summary>
internal sealed class IndexedExpansion
{
    private readonly CandidateBlock? _candidates;
    private readonly IReadOnlyList<PlanAxis> _axes;
    private readonly CombineMode _mode;
    private readonly double[,]? _unit;
    private readonly long _inner;

    public IndexedExpansion(CombineMode mode, int? count, ulong seed, CandidateBlock? candidates, IReadOnlyList<PlanAxis> axes)
    {
        _mode = mode;
        _candidates = candidates;
        _axes = axes;
        _unit = mode switch
        {
            CombineMode.LatinHypercube => LatinHypercube.Sample(count ?? 1, axes.Count, seed),
            CombineMode.Random => LatinHypercube.Random(count ?? 1, axes.Count, seed),
            _ => null,
        };
        _inner = SweepExpansion.Count(mode, count, null, axes);
        Count = SweepExpansion.Count(mode, count, candidates, axes);
    }

    /// <summary>Points before duplicates are collapsed.</summary>
    public long Count { get; }

    /// <summary>Number of columns: candidate columns first, then the axes in file order.</summary>
    public int Columns => (_candidates?.Columns.Length ?? 0) + _axes.Count;

    /// <summary>Point <paramref name="k"/>'s values in column order, written to <paramref name="into"/>.</summary>
    public void Fill(long k, Span<object> into)
    {
        var row = Math.DivRem(k, Math.Max(1, _inner), out var inner);
        var at = 0;
        if (_candidates is { } c)
        {
            var values = c.Rows[(int)row];
            for (var j = 0; j < values.Length; j++)
            {
                into[at++] = values[j];
            }
        }

        switch (_mode)
        {
            case CombineMode.Grid:
                for (var j = _axes.Count - 1; j >= 0; j--)
                {
                    var n = _axes[j].Values.Length;
                    inner = Math.DivRem(inner, n, out var digit);
                    into[at + j] = _axes[j].Values[(int)digit];
                }

                break;
            case CombineMode.Zip:
                for (var j = 0; j < _axes.Count; j++)
                {
                    into[at + j] = _axes[j].Values[(int)inner];
                }

                break;
            default:
                for (var j = 0; j < _axes.Count; j++)
                {
                    into[at + j] = _axes[j].ValueAt(_unit![inner, j]);
                }

                break;
        }
    }

    /// <summary>The axis behind column <paramref name="column"/>; null for a candidates column.</summary>
    public PlanAxis? AxisOfColumn(int column)
    {
        var first = _candidates?.Columns.Length ?? 0;
        return column >= first ? _axes[column - first] : null;
    }

    /// <summary>Point <paramref name="k"/>'s value of column <paramref name="column"/>.</summary>
    public object Value(long k, int column)
    {
        var values = new object[Columns];
        Fill(k, values);
        return values[column];
    }
}
