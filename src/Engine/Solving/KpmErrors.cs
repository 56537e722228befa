using System.Collections.Immutable;
using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Thermal;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// Standard errors of a kernel-polynomial point from its random vectors: every number is linear in
/// the moments, so each vector's moments alone give that vector's estimate, and the spread of the
/// estimates over the R vectors, divided by sqrt(R), is the standard error of their mean (which is
/// the reported value). With one vector there is no spread: the errors are null.
/// </summary>
internal static class KpmErrors
{
    public static StatisticalErrors? Of(KpmSpectrum kpm, FrequencyGrid fine, FrequencyGrid output, double[] temperatures, int reportedTemperatures, int referenceIndex, double? floorOmega)
    {
        var r = kpm.Vectors;
        if (r < 2)
        {
            return null;
        }

        var lattice = kpm.Lattice;
        var m = kpm.Moments;
        var layers = lattice.LayerCount;
        var c = lattice.Components;

        // Per vector: the total density, and the surface and interior mean displacement densities.
        var sets = 3;
        var moments = new double[r * sets * m];
        var interiorSites = 0L;
        for (var l = 1; l < layers; l++)
        {
            interiorSites += lattice.LayerSites[l];
        }

        for (var v = 0; v < r; v++)
        {
            var vector = kpm.PerVector.AsSpan(v * kpm.Groups * m, kpm.Groups * m);
            var total = moments.AsSpan(((v * sets) + 0) * m, m);
            var surface = moments.AsSpan(((v * sets) + 1) * m, m);
            var interior = moments.AsSpan(((v * sets) + 2) * m, m);
            vector[..m].CopyTo(total);
            for (var a = 0; a < c && layers > 0; a++)
            {
                var s = vector.Slice(kpm.DisplacementGroup(((lattice.Crystal.Sites + 0) * c) + a) * m, m);
                for (var n = 0; n < m; n++)
                {
                    surface[n] += s[n] / c;
                }

                for (var l = 1; l < layers; l++)
                {
                    var share = (double)lattice.LayerSites[l] / interiorSites / c;
                    var g = vector.Slice(kpm.DisplacementGroup(((lattice.Crystal.Sites + l) * c) + a) * m, m);
                    for (var n = 0; n < m; n++)
                    {
                        interior[n] += share * g[n];
                    }
                }
            }
        }

        var fineMasses = kpm.Between(KpmSpectrum.Edges(fine), moments, r * sets);
        var outputMasses = kpm.Between(KpmSpectrum.Edges(output), moments, r * sets);
        var perMol = PhysicalConstants.AvogadroPerMol / lattice.AtomCount;
        var t = temperatures.Length;
        var u = new double[r * t];
        var f = new double[r * t];
        var s2 = new double[r * t];
        var cv = new double[r * t];
        var zpe = new double[r];
        var msdSurface = new double[r];
        var msdInterior = new double[r];
        for (var v = 0; v < r; v++)
        {
            for (var ti = 0; ti < t; ti++)
            {
                var sums = default(ThermalSums);
                for (var b = 0; b < fine.Bins; b++)
                {
                    var omega = 2 * Math.PI * 1e12 * fine.Centre(b);
                    ModeThermodynamics.Accumulate(omega, fineMasses[(b * r * sets) + (v * sets)], temperatures[ti], ref sums);
                }

                u[(v * t) + ti] = sums.Internal * perMol;
                f[(v * t) + ti] = sums.Free * perMol;
                s2[(v * t) + ti] = sums.Entropy * perMol;
                cv[(v * t) + ti] = sums.HeatCapacity * perMol;
                if (ti == 0)
                {
                    zpe[v] = sums.ZeroPoint * perMol;
                }
            }

            if (floorOmega is { } floor && layers > 0 && referenceIndex >= 0)
            {
                for (var b = 0; b < fine.Bins; b++)
                {
                    var omega = Math.Max(2 * Math.PI * 1e12 * fine.Centre(b), floor);
                    var factor = PhysicalConstants.HbarJS / (2 * omega) * RealSpaceKpmSolver.CothHalf(omega, temperatures[referenceIndex]) * 1e18;
                    msdSurface[v] += factor * fineMasses[(b * r * sets) + (v * sets) + 1];
                    msdInterior[v] += factor * fineMasses[(b * r * sets) + (v * sets) + 2];
                }
            }
        }

        var thermal = ImmutableArray.CreateBuilder<ThermalRow>(reportedTemperatures);
        for (var ti = 0; ti < reportedTemperatures; ti++)
        {
            thermal.Add(new ThermalRow(temperatures[ti], Error(u, ti, t, r), Error(f, ti, t, r), Error(s2, ti, t, r), Error(cv, ti, t, r), null));
        }

        var perCell = (double)lattice.Crystal.Sites / lattice.AtomCount;
        var dos = ImmutableArray.CreateBuilder<double>(output.Bins);
        for (var b = 0; b < output.Bins; b++)
        {
            var values = new double[r];
            for (var v = 0; v < r; v++)
            {
                values[v] = outputMasses[(b * r * sets) + (v * sets)] * perCell / output.WidthThz;
            }

            dos.Add(StandardError(values));
        }

        double? Nullable(double x) => double.IsFinite(x) ? x : null;
        return new StatisticalErrors
        {
            Source = "random vectors",
            Samples = r,
            Thermal = thermal.MoveToImmutable(),
            HeatCapacityJPerMolK = referenceIndex >= 0 ? Nullable(Error(cv, referenceIndex, t, r)) : null,
            EntropyJPerMolK = referenceIndex >= 0 ? Nullable(Error(s2, referenceIndex, t, r)) : null,
            FreeEnergyJPerMol = referenceIndex >= 0 ? Nullable(Error(f, referenceIndex, t, r)) : null,
            InternalEnergyJPerMol = referenceIndex >= 0 ? Nullable(Error(u, referenceIndex, t, r)) : null,
            ZeroPointEnergyJPerMol = Nullable(StandardError(zpe)),
            MsdSurfaceNm2 = floorOmega is null || layers == 0 ? null : Nullable(StandardError(msdSurface)),
            MsdInteriorNm2 = floorOmega is null || layers < 2 ? null : Nullable(StandardError(msdInterior)),
            DosTotal = dos.MoveToImmutable(),
        };
    }

    private static double Error(double[] values, int ti, int t, int r)
    {
        var x = new double[r];
        for (var v = 0; v < r; v++)
        {
            x[v] = values[(v * t) + ti];
        }

        return StandardError(x);
    }

    /// <summary>Sample standard deviation / sqrt(count).</summary>
    public static double StandardError(ReadOnlySpan<double> x)
    {
        if (x.Length < 2)
        {
            return double.NaN;
        }

        var mean = 0.0;
        foreach (var v in x)
        {
            mean += v;
        }

        mean /= x.Length;
        var sum = 0.0;
        foreach (var v in x)
        {
            sum += (v - mean) * (v - mean);
        }

        return Math.Sqrt(sum / (x.Length - 1) / x.Length);
    }
}
