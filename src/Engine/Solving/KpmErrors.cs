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
    /// <summary>
    /// The point's errors, and those of its layers: <see cref="Set.LayerMsdNm2"/>[(t * layers + l) * c + a] for the
    /// reported temperatures (null without displacements), <see cref="Set.LayerDos"/>[l][bin] on the output grid.
    /// </summary>
    public sealed record Set(StatisticalErrors Point, double[]? LayerMsdNm2, double[][] LayerDos);

    public static Set? Of(KpmSpectrum kpm, FrequencyGrid fine, FrequencyGrid output, double[] temperatures, int reportedTemperatures, int referenceIndex, double? floorOmega)
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

        // No layers (a cut sample where no atom lost a nearest neighbour, or a periodic box): every atom is interior,
        // weighted as the basis sites' values are.
        var allInterior = layers == 0;

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

            for (var a = 0; a < c && allInterior; a++)
            {
                for (var b = 0; b < lattice.Crystal.Sites; b++)
                {
                    var share = (double)lattice.BasisSites[b] / lattice.Sites / c;
                    var g = vector.Slice(kpm.DisplacementGroup((b * c) + a) * m, m);
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

            if (floorOmega is { } floor && (layers > 0 || allInterior) && referenceIndex >= 0)
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
        var point = new StatisticalErrors
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
            MsdInteriorNm2 = floorOmega is null || (layers < 2 && !allInterior) ? null : Nullable(StandardError(msdInterior)),
            DosTotal = dos.MoveToImmutable(),
        };
        return new Set(point, LayerMsd(kpm, fine, temperatures, reportedTemperatures, floorOmega), LayerDensities(kpm, output));
    }

    /// <summary>
    /// Each layer's mean-square displacement per direction, per vector and temperature, integrated as the
    /// reported value is (same floor, same fine grid), and its spread over the vectors: a small layer
    /// averages few atoms of each vector, so its error is much larger than the point's.
    /// </summary>
    private static double[]? LayerMsd(KpmSpectrum kpm, FrequencyGrid fine, double[] temperatures, int reported, double? floorOmega)
    {
        var lattice = kpm.Lattice;
        var layers = lattice.LayerCount;
        var c = lattice.Components;
        var channels = layers * c;
        if (floorOmega is not { } floor || channels == 0)
        {
            return null;
        }

        var r = kpm.Vectors;
        var m = kpm.Moments;
        var moments = new double[r * channels * m];
        for (var v = 0; v < r; v++)
        {
            for (var ch = 0; ch < channels; ch++)
            {
                var group = kpm.DisplacementGroup((lattice.Crystal.Sites * c) + ch);
                kpm.PerVector.AsSpan(((v * kpm.Groups) + group) * m, m).CopyTo(moments.AsSpan(((v * channels) + ch) * m, m));
            }
        }

        var masses = kpm.Between(KpmSpectrum.Edges(fine), moments, r * channels);
        var perVector = new double[r * reported * channels];
        for (var b = 0; b < fine.Bins; b++)
        {
            var omega = Math.Max(2 * Math.PI * 1e12 * fine.Centre(b), floor);
            var row = masses.AsSpan(b * r * channels, r * channels);
            for (var t = 0; t < reported; t++)
            {
                var factor = PhysicalConstants.HbarJS / (2 * omega) * RealSpaceKpmSolver.CothHalf(omega, temperatures[t]) * 1e18;
                for (var v = 0; v < r; v++)
                {
                    var at = ((v * reported) + t) * channels;
                    for (var ch = 0; ch < channels; ch++)
                    {
                        perVector[at + ch] += factor * row[(v * channels) + ch];
                    }
                }
            }
        }

        var errors = new double[reported * channels];
        var values = new double[r];
        for (var t = 0; t < reported; t++)
        {
            for (var ch = 0; ch < channels; ch++)
            {
                for (var v = 0; v < r; v++)
                {
                    values[v] = perVector[(((v * reported) + t) * channels) + ch];
                }

                errors[(t * channels) + ch] = StandardError(values);
            }
        }

        return errors;
    }

    /// <summary>Each layer's density per atom on the output grid, per vector, and its spread over the vectors.</summary>
    private static double[][] LayerDensities(KpmSpectrum kpm, FrequencyGrid output)
    {
        var lattice = kpm.Lattice;
        var layers = lattice.LayerCount;
        var r = kpm.Vectors;
        var m = kpm.Moments;
        var moments = new double[r * layers * m];
        for (var v = 0; v < r; v++)
        {
            for (var l = 0; l < layers; l++)
            {
                kpm.PerVector.AsSpan(((v * kpm.Groups) + kpm.LayerGroup(l)) * m, m).CopyTo(moments.AsSpan(((v * layers) + l) * m, m));
            }
        }

        var masses = kpm.Between(KpmSpectrum.Edges(output), moments, r * layers);
        var result = new double[layers][];
        var values = new double[r];
        for (var l = 0; l < layers; l++)
        {
            result[l] = new double[output.Bins];
            for (var b = 0; b < output.Bins; b++)
            {
                for (var v = 0; v < r; v++)
                {
                    values[v] = masses[(b * r * layers) + (v * layers) + l] / lattice.LayerSites[l] / output.WidthThz;
                }

                result[l][b] = StandardError(values);
            }
        }

        return result;
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
