using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Engine.Tests.RealSpace;

/// <summary>
/// Every standard error of a kernel-polynomial point against the scatter of its value over many seeds of
/// the random vectors. If the errors are right, r = (spread over seeds) / (root-mean-square stated error)
/// is 1 up to chance: ln r = (ln s^2 - ln mean(se^2)) / 2 has a standard deviation of about
/// sqrt(1 / (2 (n - 1)) + v / (4 n)) for n seeds, where the first term is the sample variance's own
/// (normal values; common practice, no source) and v the relative variance of se^2 over the seeds,
/// measured. The bound is four of those deviations, derived, not tuned: a stated error off by the
/// factor the centre layer of a small cluster needs (about 7 against the surface's) fails by far.
/// </summary>
public sealed class KernelPolynomialErrorTests
{
    private const int Seeds = 48;

    private static readonly SolveOptions Options = new() { TemperaturesK = [20, 100], ReferenceTemperatureK = 100, DosBins = 40 };

    /// <summary>An invented simple cubic crystal with transverse springs, cut to a free 5 x 5 x 5 cube (125 atoms, 3 layers).</summary>
    private static CrystalModel Cubic() => CrystalModel.Create(Lattice.SimpleCubic(0.3), [new Site("A", "A", Vec3.Zero, 28)],
        [new ShellSpring("A", "A", 1, 30, 3), new ShellSpring("A", "A", 2, 8, 0)]);

    private static RealSpaceSample Cube(long seed) => RealSpaceSample.Box(5, 5, 5, Boundary.Free, Boundary.Free, Boundary.Free) with
    {
        Method = RealSpaceMethod.KernelPolynomial,
        Kpm = new KpmSettings { Moments = 256, RandomVectors = 8, Seed = seed },
    };

    [Fact]
    public void Every_standard_error_of_a_point_and_of_its_layers_matches_the_scatter_over_seeds()
    {
        var runs = Enumerable.Range(1, Seeds).Select(s => PhononSolver.Solve(Cubic(), Cube(s), Options)).ToList();
        var reference = 1; // 100 K in the thermal table
        Check(runs, r => r.Summary.HeatCapacityJPerMolK, r => r.Errors!.HeatCapacityJPerMolK, "cv");
        Check(runs, r => r.Summary.EntropyJPerMolK, r => r.Errors!.EntropyJPerMolK, "entropy");
        Check(runs, r => r.Summary.FreeEnergyJPerMol, r => r.Errors!.FreeEnergyJPerMol, "free energy");
        Check(runs, r => r.Summary.InternalEnergyJPerMol, r => r.Errors!.InternalEnergyJPerMol, "internal energy");
        Check(runs, r => r.Summary.ZeroPointEnergyJPerMol, r => r.Errors!.ZeroPointEnergyJPerMol, "zero-point energy");
        Check(runs, r => r.Thermal[0].HeatCapacityJPerMolK, r => r.Errors!.Thermal[0].HeatCapacityJPerMolK, "cv at 20 K");
        Check(runs, r => r.Surface!.MsdSurfaceNm2, r => r.Errors!.MsdSurfaceNm2, "msd_surface");
        Check(runs, r => r.Surface!.MsdInteriorNm2, r => r.Errors!.MsdInteriorNm2, "msd_interior");

        var layers = runs[0].Surface!.LayerCount;
        Assert.Equal(3, layers);
        for (var l = 0; l < layers; l++)
        {
            var row = (reference * layers) + l;
            Check(runs, r => r.Surface!.Layers[row].MsdXNm2, r => r.Surface!.Layers[row].MsdXStderrNm2, $"layer {l} msd_x");
            Check(runs, r => r.Surface!.Layers[row].MsdZNm2, r => r.Surface!.Layers[row].MsdZStderrNm2, $"layer {l} msd_z");

            // The three bins where the layer has most states (where its error matters).
            var mean = Enumerable.Range(0, Options.DosBins).Select(b => runs.Average(r => r.Surface!.LayerDos[l].DensityPerThzPerAtom[b])).ToArray();
            foreach (var b in Enumerable.Range(0, mean.Length).OrderByDescending(b => mean[b]).Take(3))
            {
                Check(runs, r => r.Surface!.LayerDos[l].DensityPerThzPerAtom[b], r => r.Surface!.LayerDos[l].StandardErrorPerThzPerAtom[b], $"layer {l} dos bin {b}");
            }
        }

        // The one-atom centre layer scatters far more than the surface: its own error, not the point's.
        var centre = (reference * layers) + 2;
        Assert.True(runs[0].Surface!.Layers[centre].MsdXStderrNm2 > 3 * runs[0].Errors!.MsdSurfaceNm2, "the centre layer's error is its own");
    }

    [Fact]
    public void The_virtual_crystal_has_its_own_error_and_random_vectors_independent_of_the_configurations()
    {
        // One configuration (its draw fixed by the disorder seed), so both numbers scatter over the vectors' seeds alone.
        var runs = Enumerable.Range(1, Seeds).Select(s => PhononSolver.Solve(Cubic(), Cube(s) with
        {
            Disorder = new Disorder([new SiteSubstitution("A", 45, 0.3, 1.0)], 1, Seed: 3),
        }, Options)).ToList();
        Check(runs, r => r.Ordered!.Summary.HeatCapacityJPerMolK, r => r.Ordered!.Errors!.HeatCapacityJPerMolK, "ordered cv");
        Check(runs, r => r.Ordered!.Summary.EntropyJPerMolK, r => r.Ordered!.Errors!.EntropyJPerMolK, "ordered entropy");
        Check(runs, r => r.Ordered!.Surface!.MsdSurfaceNm2, r => r.Ordered!.Errors!.MsdSurfaceNm2, "ordered msd_surface");

        // Independent estimates: their correlation over n seeds is normal with deviation 1 / sqrt(n)
        // (common practice, no source); vectors shared with a configuration would correlate them near 1.
        var cv = runs.Select(r => r.Summary.HeatCapacityJPerMolK!.Value).ToArray();
        var ordered = runs.Select(r => r.Ordered!.Summary.HeatCapacityJPerMolK!.Value).ToArray();
        var correlation = Correlation(cv, ordered);
        Assert.True(Math.Abs(correlation) <= 4 / Math.Sqrt(Seeds), $"cv and ordered_cv correlate over the seeds: {correlation:F3}");
    }

    private static void Check(IReadOnlyList<PointResult> runs, Func<PointResult, double?> value, Func<PointResult, double?> error, string what)
    {
        var x = runs.Select(r => value(r) ?? double.NaN).ToArray();
        var se = runs.Select(r => error(r) ?? double.NaN).ToArray();
        Assert.True(x.All(double.IsFinite) && se.All(v => double.IsFinite(v) && v > 0), $"{what}: every seed has a value and a positive standard error");
        var n = x.Length;
        var mean = x.Average();
        var spread2 = x.Sum(v => (v - mean) * (v - mean)) / (n - 1);
        var squares = se.Select(v => v * v).ToArray();
        var meanSquare = squares.Average();
        var relativeVariance = squares.Sum(v => (v - meanSquare) * (v - meanSquare)) / (n - 1) / (meanSquare * meanSquare);
        var ratio = Math.Sqrt(spread2 / meanSquare);
        var logDeviation = Math.Sqrt((1.0 / (2 * (n - 1))) + (relativeVariance / (4 * n)));
        Assert.True(Math.Abs(Math.Log(ratio)) <= 4 * logDeviation,
            $"{what}: spread over {n} seeds / stated error = {ratio:F3}, allowed exp(+-{4 * logDeviation:F3})");
    }

    private static double Correlation(double[] a, double[] b)
    {
        var ma = a.Average();
        var mb = b.Average();
        var cov = a.Zip(b).Sum(p => (p.First - ma) * (p.Second - mb));
        return cov / Math.Sqrt(a.Sum(v => (v - ma) * (v - ma)) * b.Sum(v => (v - mb) * (v - mb)));
    }
}
