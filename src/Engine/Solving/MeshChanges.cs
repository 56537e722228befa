using System.Collections.Immutable;
using LatticeSweep.Engine.Results;

namespace LatticeSweep.Engine.Solving;

/// <summary>The differences a <see cref="MeshChange"/> holds: a point on its mesh minus the same point on the check mesh.</summary>
internal static class MeshChanges
{
    public static MeshChange Between(PointResult main, PointResult coarse, ImmutableArray<int> checkMesh)
    {
        var thermal = ImmutableArray.CreateBuilder<ThermalRow>(main.Thermal.Length);
        var msd = ImmutableArray.CreateBuilder<double?>(main.Thermal.Length);
        for (var i = 0; i < main.Thermal.Length; i++)
        {
            var a = main.Thermal[i];
            var b = coarse.Thermal[i];
            thermal.Add(new ThermalRow(
                a.TemperatureK,
                a.InternalEnergyJPerMol - b.InternalEnergyJPerMol,
                a.FreeEnergyJPerMol - b.FreeEnergyJPerMol,
                a.EntropyJPerMolK - b.EntropyJPerMolK,
                a.HeatCapacityJPerMolK - b.HeatCapacityJPerMolK,
                a.DebyeTemperatureK - b.DebyeTemperatureK));
            msd.Add(LargestDisplacementChange(main.Displacements, coarse.Displacements, a.TemperatureK));
        }

        var s = main.Summary;
        var c = coarse.Summary;
        return new MeshChange
        {
            CheckMesh = checkMesh,
            Thermal = thermal.MoveToImmutable(),
            MsdNm2 = msd.MoveToImmutable(),
            HeatCapacityJPerMolK = s.HeatCapacityJPerMolK - c.HeatCapacityJPerMolK,
            EntropyJPerMolK = s.EntropyJPerMolK - c.EntropyJPerMolK,
            FreeEnergyJPerMol = s.FreeEnergyJPerMol - c.FreeEnergyJPerMol,
            InternalEnergyJPerMol = s.InternalEnergyJPerMol - c.InternalEnergyJPerMol,
            ZeroPointEnergyJPerMol = s.ZeroPointEnergyJPerMol - c.ZeroPointEnergyJPerMol,
            DosStateFraction = CumulativeDistance(main.Dos, coarse.Dos, s.BranchCount),
        };
    }

    /// <summary>
    /// The change of largest size over sites and directions at one temperature; null where any value
    /// diverges (bulk 1D and 2D) or none were computed. Rows pair by site, both lists in the same order.
    /// </summary>
    private static double? LargestDisplacementChange(ImmutableArray<DisplacementRow> main, ImmutableArray<DisplacementRow> coarse, double temperatureK)
    {
        double? largest = null;
        for (var i = 0; i < main.Length && i < coarse.Length; i++)
        {
            if (main[i].TemperatureK != temperatureK)
            {
                continue;
            }

            foreach (var (a, b) in new[] { (main[i].MsdXNm2, coarse[i].MsdXNm2), (main[i].MsdYNm2, coarse[i].MsdYNm2), (main[i].MsdZNm2, coarse[i].MsdZNm2) })
            {
                if (a is not { } x || b is not { } y)
                {
                    continue;
                }

                if (!double.IsFinite(x) || !double.IsFinite(y))
                {
                    return null;
                }

                if (largest is null || Math.Abs(x - y) > Math.Abs(largest.Value))
                {
                    largest = x - y;
                }
            }
        }

        return largest;
    }

    /// <summary>
    /// Largest distance between the two curves' cumulative state counts N(f), over the main curve's bin
    /// edges, as a fraction of all states: one number for how far the spectrum's shape moved, insensitive
    /// to the two grids' different bins. The check curve's N is linear inside each of its bins.
    /// </summary>
    internal static double CumulativeDistance(DosCurve main, DosCurve check, int branches)
    {
        if (main.Total.Length < 2 || check.Total.Length < 2 || branches <= 0)
        {
            return double.NaN;
        }

        var w = main.FrequencyThz[1] - main.FrequencyThz[0];
        var wc = check.FrequencyThz[1] - check.FrequencyThz[0];
        var startC = check.FrequencyThz[0] - 0.5 * wc;
        var cumulativeC = new double[check.Total.Length + 1];
        for (var b = 0; b < check.Total.Length; b++)
        {
            cumulativeC[b + 1] = cumulativeC[b] + check.Total[b] * wc;
        }

        double CheckAt(double f)
        {
            var x = (f - startC) / wc;
            if (x <= 0)
            {
                return 0;
            }

            if (x >= check.Total.Length)
            {
                return cumulativeC[^1];
            }

            var k = (int)x;
            return cumulativeC[k] + (x - k) * (cumulativeC[k + 1] - cumulativeC[k]);
        }

        var start = main.FrequencyThz[0] - 0.5 * w;
        var n = 0.0;
        var largest = Math.Abs(CheckAt(start));
        for (var b = 0; b < main.Total.Length; b++)
        {
            n += main.Total[b] * w;
            largest = Math.Max(largest, Math.Abs(n - CheckAt(start + (b + 1) * w)));
        }

        return largest / branches;
    }
}
