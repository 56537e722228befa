using System.Diagnostics;
using System.Numerics;
using System.Runtime.Intrinsics;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Bench;

/// <summary>
/// Case eigen-paths: every path of the batched eigen-solver (each SIMD width this processor runs
/// natively, each method) on the same random Hermitian stacks, order by order, eigenvalues alone and
/// with vectors. The paths are timed in turns (round-robin, several rounds, medians of process CPU time),
/// so a burst of other work on the machine hits them alike. The fastest per order is what BatchPlan should choose;
/// the run prints the plan in force beside it.
/// </summary>
internal static class EigenPathsCase
{
    private const int MatricesPerCall = 2048;

    public static Dictionary<string, object> Run(int rounds, int[] sizes)
    {
        var widths = new List<SimdWidth> { SimdWidth.Scalar };
        if (Vector256.IsHardwareAccelerated)
        {
            widths.Add(SimdWidth.Bits256);
        }

        if (Vector512.IsHardwareAccelerated)
        {
            widths.Add(SimdWidth.Bits512);
        }

        var results = new Dictionary<string, object>();
        foreach (var n in sizes)
        {
            var count = Math.Max(64, MatricesPerCall * 36 / (n * n));
            var matrices = new Complex[count * n * n];
            var random = new Random(4242 + n);
            for (var m = 0; m < count; m++)
            {
                for (var i = 0; i < n; i++)
                {
                    for (var j = i; j < n; j++)
                    {
                        var v = i == j ? new Complex(random.NextDouble() - 0.5, 0) : new Complex(random.NextDouble() - 0.5, random.NextDouble() - 0.5);
                        matrices[(m * n * n) + (i * n) + j] = v;
                        matrices[(m * n * n) + (j * n) + i] = Complex.Conjugate(v);
                    }
                }
            }

            var values = new double[count * n];
            var vectors = new Complex[count * n * n];
            var row = new Dictionary<string, object>();
            foreach (var wantVectors in new[] { false, true })
            {
                var paths = new List<(string Name, SimdWidth Width, BatchMethod Method)>();
                foreach (var width in widths)
                {
                    if (width == SimdWidth.Scalar)
                    {
                        paths.Add(("one-by-one", width, BatchMethod.OneByOne));
                        continue;
                    }

                    var bits = width == SimdWidth.Bits512 ? 512 : 256;
                    if (n <= BatchJacobi.MaxOrder)
                    {
                        paths.Add(($"jacobi-{bits}", width, BatchMethod.Jacobi));
                    }
                    paths.Add(($"tridiagonal-{bits}", width, BatchMethod.Tridiagonal));
                }

                var samples = paths.Select(_ => new List<double>()).ToArray();
                for (var round = 0; round < rounds + 1; round++)
                {
                    for (var p = 0; p < paths.Count; p++)
                    {
                        var (_, width, method) = paths[p];
                        // Process CPU time, not wall time: other work on the machine takes turns on the
                        // cores but is not charged to this process.
                        var cpu0 = Environment.CpuUsage.TotalTime;
                        var sw = Stopwatch.StartNew();
                        var calls = 0;
                        do
                        {
                            HermitianEigenSolver.SolveBatch(matrices, n, count, values, wantVectors ? vectors : [], width, method);
                            calls++;
                        }
                        while (sw.Elapsed.TotalSeconds < 0.05);
                        if (round > 0)
                        {
                            samples[p].Add((Environment.CpuUsage.TotalTime - cpu0).TotalSeconds / calls / count * 1e6);
                        }
                    }
                }

                var medians = samples.Select(s => s.Order().ElementAt(s.Count / 2)).ToArray();
                var best = Array.IndexOf(medians, medians.Min());
                var plannedName = EigenCase.PathName(n, wantVectors);
                var kind = wantVectors ? "vectors" : "values";
                row[kind] = paths.Select((p, i) => (p.Name, medians[i])).ToDictionary(x => x.Name, x => (object)x.Item2);
                row[$"{kind}_fastest"] = paths[best].Name;
                row[$"{kind}_planned"] = plannedName;
                Console.Error.WriteLine($"  {n,2}x{n,-2} {kind,-7}: " + string.Join("  ", paths.Select((p, i) => $"{p.Name} {medians[i],8:F3}")) +
                    $"  us/matrix; fastest {paths[best].Name}, planned {plannedName}{(plannedName == paths[best].Name ? "" : $" ({medians[paths.FindIndex(p => p.Name == plannedName)] / medians[best]:F2}x the fastest)")}");
            }

            results[$"{n}"] = row;
        }

        return results;
    }
}
