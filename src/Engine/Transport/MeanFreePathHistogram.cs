using System.Collections.Immutable;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Kappa contributions binned by mean free path on a logarithmic grid, 10 bins per decade from
/// 0.01 nm to 1 m (modes below the first edge count in the first bin, above the last in the last).
/// </summary>
internal sealed class MeanFreePathHistogram
{
    private const double FirstEdgeNm = 1e-2;
    private const int BinsPerDecade = 10;
    private const int Decades = 11;
    private readonly double[] _bins = new double[BinsPerDecade * Decades];

    public void Add(double meanFreePathM, double contribution)
    {
        var nm = meanFreePathM * 1e9;
        var position = nm > 0 ? (Math.Log10(nm) - Math.Log10(FirstEdgeNm)) * BinsPerDecade : 0;
        var bin = double.IsFinite(position) ? (int)Math.Clamp(Math.Floor(position), 0, _bins.Length - 1) : _bins.Length - 1;
        _bins[bin] += contribution;
    }

    /// <summary>Cumulative rows at each bin's upper edge, scaled by <paramref name="scale"/> to W/(m K).</summary>
    public ImmutableArray<MeanFreePathRow> Rows(double scale)
    {
        var total = _bins.Sum();
        var rows = ImmutableArray.CreateBuilder<MeanFreePathRow>(_bins.Length);
        var running = 0.0;
        for (var b = 0; b < _bins.Length; b++)
        {
            running += _bins[b];
            var edge = FirstEdgeNm * Math.Pow(10, (b + 1) / (double)BinsPerDecade);
            rows.Add(new MeanFreePathRow(edge, running * scale, total > 0 ? running / total : 0));
        }

        return rows.MoveToImmutable();
    }
}
