using System.Collections.Immutable;
using System.Globalization;
using LatticeSweep.Worker.JobFiles;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// The bins a drawn axis's coverage is counted in: <see cref="DrawnRange.Bins"/> equal widths of its
/// interval on its scale (linear, or logarithmic as the job file gives it), each known by its lower
/// edge. A drawn axis has one point per value, so counting it by value would keep a row per point;
/// its bins keep the coverage a few rows whatever the count. Edges inside the interval are rounded to
/// 12 significant digits like every generated value; a bin holds the values from its lower edge up to
/// the next bin's (that edge not included), the last one up to the interval's end (included). A
/// whole-number axis's bins are runs of whole numbers (both ends included), at most one per whole
/// number of the interval, so a short interval is counted per value.
/// </summary>
public sealed class AxisBins
{
    /// <summary>The most bins a drawn axis is counted in (fewer when fewer values are drawn, or a whole-number interval holds fewer).</summary>
    public const int MostBins = 100;

    private readonly double[] _starts;
    private readonly double _end;
    private readonly bool _integer;

    private AxisBins(double[] starts, double end, bool integer, bool log)
    {
        _starts = starts;
        _end = end;
        _integer = integer;
        Log = log;
    }

    /// <summary>How many bins.</summary>
    public int Count => _starts.Length;

    /// <summary>Whether the bins are of equal width on a logarithmic scale.</summary>
    public bool Log { get; }

    /// <summary>The number of bins to keep for an axis drawn <paramref name="draws"/> times (fixed at submit).</summary>
    public static int BinsFor(long draws) => (int)Math.Clamp(draws, 1, MostBins);

    /// <summary>The bins of <paramref name="axis"/>, or null for an axis of listed values.</summary>
    public static AxisBins? Of(AxisInfo axis)
    {
        ArgumentNullException.ThrowIfNull(axis);
        return axis.Drawn is { } d ? Of(d, axis.ValueType == AxisValueType.Integer) : null;
    }

    /// <summary>The bins of a drawn interval; <paramref name="integer"/> for a whole-number axis.</summary>
    public static AxisBins Of(DrawnRange range, bool integer)
    {
        ArgumentNullException.ThrowIfNull(range);
        var (lo, hi) = (range.Low, range.High);
        var bins = Math.Max(1, range.Bins);
        if (integer)
        {
            var first = Math.Ceiling(lo);
            var last = Math.Floor(hi);
            var wholes = last - first + 1;
            bins = (int)Math.Max(1, Math.Min(bins, wholes));
            var starts = new List<double> { first };
            for (var k = 1; k < bins; k++)
            {
                // Linear: runs of equal length (within one); log: the whole number nearest the edge, as a drawn value is rounded.
                var start = range.Log
                    ? Math.Round(Spacing.Map(lo, hi, (double)k / bins, true), MidpointRounding.AwayFromZero)
                    : first + Math.Floor(k * wholes / bins);
                start = Math.Max(start, starts[^1] + 1);
                if (start > last)
                {
                    break;
                }

                starts.Add(start);
            }

            return new AxisBins([.. starts], last, integer: true, range.Log);
        }

        var edges = new double[bins];
        edges[0] = lo;
        for (var k = 1; k < bins; k++)
        {
            edges[k] = Spacing.Round(Spacing.Map(lo, hi, (double)k / bins, range.Log));
        }

        return new AxisBins(edges, hi, integer: false, range.Log);
    }

    /// <summary>The bin holding <paramref name="value"/>: the last whose lower edge is at or below it (values outside the interval go to the nearer end's bin).</summary>
    public int IndexOf(double value)
    {
        var at = Array.BinarySearch(_starts, value);
        var k = at >= 0 ? at : ~at - 1;
        return Math.Clamp(k, 0, _starts.Length - 1);
    }

    /// <summary>The bin holding a value of the axis (a number; anything else goes to the first bin).</summary>
    public int IndexOf(object value) => IndexOf(value switch
    {
        double d => d,
        long l => l,
        int i => i,
        IConvertible x => x.ToDouble(CultureInfo.InvariantCulture),
        _ => double.NaN,
    });

    /// <summary>Bin <paramref name="k"/>'s lower edge, typed as the axis's values (the bin's key in the coverage counts).</summary>
    public object Lower(int k) => _integer ? (object)(long)_starts[k] : _starts[k];

    /// <summary>Bin <paramref name="k"/>'s upper edge: the next bin's lower edge (not included), or for the last bin and a whole-number bin its own last value (included).</summary>
    public object Upper(int k) => _integer
        ? (object)(long)(k + 1 < _starts.Length ? _starts[k + 1] - 1 : _end)
        : k + 1 < _starts.Length ? _starts[k + 1] : _end;

    /// <summary>Whether bin <paramref name="k"/> includes its upper edge (the last bin, and every whole-number bin).</summary>
    public bool IncludesUpper(int k) => _integer || k == _starts.Length - 1;

    /// <summary>Bin <paramref name="k"/> as people read it: <c>[10, 10.5)</c>, the last <c>[59.5, 60]</c>, whole numbers <c>[1, 4]</c> or <c>7</c>.</summary>
    public string Text(int k)
    {
        var lower = Show(Lower(k));
        var upper = Show(Upper(k));
        if (_integer && lower == upper)
        {
            return lower;
        }

        return "[" + lower + ", " + upper + (IncludesUpper(k) ? "]" : ")");
    }

    /// <summary>What the bins are, in a few words: <c>100 bins of equal width on a log scale</c>.</summary>
    public string Describe() =>
        Count.ToString(CultureInfo.InvariantCulture) + (Count == 1 ? " bin" : " bins") + " of equal width on a " + (Log ? "log" : "linear") + " scale"
        + (_integer ? ", whole numbers" : "");

    /// <summary>The interval's ends and its middle on its scale, typed as the axis's values: values the sweep may draw.</summary>
    internal IEnumerable<object> Representatives(DrawnRange range)
    {
        var (lo, hi) = (range.Low, range.High);
        var middle = Spacing.Round(Spacing.Map(lo, hi, 0.5, range.Log));
        return _integer
            ? ImmutableArray.Create<object>((long)Math.Ceiling(lo), (long)Math.Round(middle, MidpointRounding.AwayFromZero), (long)Math.Floor(hi)).Distinct()
            : ImmutableArray.Create<object>(lo, middle, hi).Distinct();
    }

    private static string Show(object value) => value switch
    {
        double d => d.ToString("R", CultureInfo.InvariantCulture),
        long l => l.ToString(CultureInfo.InvariantCulture),
        _ => value.ToString() ?? "",
    };
}
