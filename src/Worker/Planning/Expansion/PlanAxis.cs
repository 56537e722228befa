using System.Collections.Immutable;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning.Fields;

namespace LatticeSweep.Worker.Planning.Expansion;

/// <summary>
/// A resolved axis: the field it sets (null for a candidates text column kept as-is), its column,
/// and either a list of checked values or, under a sampling combine, an interval to sample.
/// </summary>
internal sealed record PlanAxis(
    string Path,
    string Column,
    string Unit,
    AxisValueType ValueType,
    SweepField? Field,
    ImmutableArray<object> Values,
    RangeSource? Interval)
{
    /// <summary>The value at unit-cube coordinate <paramref name="u"/> in [0, 1) (sampling combines).</summary>
    public object ValueAt(double u)
    {
        if (Interval is not { } r)
        {
            return Values[Math.Min(Values.Length - 1, (int)(u * Values.Length))];
        }

        if (ValueType == AxisValueType.Integer)
        {
            var lo = (long)Math.Ceiling(r.From);
            var hi = (long)Math.Floor(r.To);
            var v = r.Log ? (long)Math.Round(Spacing.Map(r.From, r.To, u, true)) : lo + (long)(u * (hi - lo + 1));
            return Math.Clamp(v, lo, hi);
        }

        return Spacing.Drawn(r.From, r.To, u, r.Log);
    }
}

/// <summary>Candidate rows: one value per column, columns in file order.</summary>
internal sealed record CandidateBlock(ImmutableArray<PlanAxis> Columns, ImmutableArray<ImmutableArray<object>> Rows);
