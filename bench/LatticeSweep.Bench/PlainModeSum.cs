using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Thermal;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Bench;

/// <summary>
/// The reference for the finite cases: the plain exact mode sum, every mode at every temperature
/// through <see cref="ModeThermodynamics.Accumulate"/>, over the same eigenvalues the engine uses.
/// Untimed; split over the machine's cores because it is slow on purpose.
/// </summary>
internal static class PlainModeSum
{
    public sealed record Rows(double[] TemperaturesK, double[] Internal, double[] Free, double[] Entropy, double[] HeatCapacity);

    public static Rows Compute(CrystalModel model, int n1, int n2, int n3, double[] temperaturesK)
    {
        var crystal = CompiledCrystal.From(model);
        var grid = new PeriodicGrid(n1, n2, n3);
        var lambdaMax = 0.0;
        {
            var probe = new ModeSolver(new DynamicalMatrix(crystal));
            foreach (var p in grid.HalfSet())
            {
                probe.SolveValues(model.Lattice.ToCartesianQ(p.Reduced));
                lambdaMax = Math.Max(lambdaMax, probe.Values[^1]);
            }
        }

        var zeroTolerance = 1e-14 * lambdaMax;
        var workers = Environment.ProcessorCount;
        var partial = new ThermalSums[workers][];
        Parallel.For(0, workers, new ParallelOptions { MaxDegreeOfParallelism = workers }, w =>
        {
            var solver = new ModeSolver(new DynamicalMatrix(crystal));
            var sums = new ThermalSums[temperaturesK.Length];
            var index = 0L;
            foreach (var p in grid.HalfSet())
            {
                if (index++ % workers != w)
                {
                    continue;
                }

                solver.SolveValues(model.Lattice.ToCartesianQ(p.Reduced));
                var skip = p.IsGamma ? crystal.Components : 0;
                for (var k = skip; k < solver.Size; k++)
                {
                    var lambda = solver.Values[k];
                    if (lambda <= zeroTolerance)
                    {
                        continue;
                    }

                    var omega = Math.Sqrt(lambda);
                    for (var t = 0; t < temperaturesK.Length; t++)
                    {
                        ModeThermodynamics.Accumulate(omega, p.Weight / (double)grid.Count, temperaturesK[t], ref sums[t]);
                    }
                }
            }

            partial[w] = sums;
        });

        var perMol = PhysicalConstants.AvogadroPerMol / model.Sites.Length;
        double Sum(int t, Func<ThermalSums, double> pick) => partial.Sum(s => pick(s[t])) * perMol;
        var count = temperaturesK.Length;
        return new Rows(
            temperaturesK,
            [.. Enumerable.Range(0, count).Select(t => Sum(t, s => s.Internal))],
            [.. Enumerable.Range(0, count).Select(t => Sum(t, s => s.Free))],
            [.. Enumerable.Range(0, count).Select(t => Sum(t, s => s.Entropy))],
            [.. Enumerable.Range(0, count).Select(t => Sum(t, s => s.HeatCapacity))]);
    }
}
