using System.Numerics;
using System.Runtime.InteropServices;
using System.Text.Json;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Bench;

/// <summary>
/// Case (a): eigenvalues alone and with vectors of random complex Hermitian matrices, one matrix at a
/// time on one core. The matrices are written to disk so the peer solves exactly the same inputs.
/// </summary>
internal static class EigenCase
{
    public static Dictionary<string, object> Run(CaseFile cases, string dataDir, int repeats)
    {
        var section = cases.Section("eigen");
        var seed = section.GetProperty("seed").GetInt32();
        var results = new Dictionary<string, object>();
        foreach (var n in CaseFile.Ints(section.GetProperty("sizes")))
        {
            var batch = section.GetProperty("batch").GetProperty(n.ToString(System.Globalization.CultureInfo.InvariantCulture)).GetInt32();
            var a = RandomHermitian(n, batch, seed + n);
            File.WriteAllBytes(Path.Combine(dataDir, $"eig_{n}_matrices.c128"), MemoryMarshal.AsBytes(a.AsSpan()).ToArray());

            var values = new double[batch * n];
            var allVectors = new Complex[batch * n * n];
            var single = new double[n];
            var vectors = new Complex[n * n];
            var nn = n * n;

            // Ours, like NumPy's batched call: the whole stack of matrices in one call (one per SIMD lane).
            void ValuesBatch() => HermitianEigenSolver.SolveBatch(a, n, batch, values, []);
            void VectorsBatch() => HermitianEigenSolver.SolveBatch(a, n, batch, values, allVectors);

            // For reference: the public one-matrix-per-call API (Householder + QL).
            void ValuesSingle()
            {
                for (var b = 0; b < batch; b++)
                {
                    HermitianEigenSolver.Eigenvalues(a.AsSpan(b * nn, nn), n, single);
                }
            }

            void VectorsSingle()
            {
                for (var b = 0; b < batch; b++)
                {
                    HermitianEigenSolver.EigenSystem(a.AsSpan(b * nn, nn), n, single, vectors);
                }
            }

            var tValues = Timing.Measure(ValuesBatch, warmups: 3, repeats: repeats, minSeconds: 0.5);
            var tVectors = Timing.Measure(VectorsBatch, warmups: 3, repeats: repeats, minSeconds: 0.5);
            var tValuesSingle = Timing.Measure(ValuesSingle, warmups: 2, repeats: repeats, minSeconds: 0.3);
            var tVectorsSingle = Timing.Measure(VectorsSingle, warmups: 2, repeats: repeats, minSeconds: 0.3);
            ValuesBatch();
            File.WriteAllBytes(Path.Combine(dataDir, $"eig_{n}_values_ours.f64"), MemoryMarshal.AsBytes(values.AsSpan()).ToArray());

            results[$"{n}"] = new Dictionary<string, object>
            {
                ["n"] = n,
                ["batch"] = batch,
                ["values_us_per_matrix"] = tValues.MedianSeconds / batch * 1e6,
                ["vectors_us_per_matrix"] = tVectors.MedianSeconds / batch * 1e6,
                ["values_cpu_us_per_matrix"] = tValues.MedianCpuSeconds / batch * 1e6,
                ["vectors_cpu_us_per_matrix"] = tVectors.MedianCpuSeconds / batch * 1e6,
                ["values_single_us_per_matrix"] = tValuesSingle.MedianSeconds / batch * 1e6,
                ["vectors_single_us_per_matrix"] = tVectorsSingle.MedianSeconds / batch * 1e6,
                ["values_path"] = PathName(n, wantVectors: false),
                ["vectors_path"] = PathName(n, wantVectors: true),
                ["values_runs"] = tValues.Samples.Length,
                ["vectors_runs"] = tVectors.Samples.Length,
            };
            Console.Error.WriteLine($"  eigen {n}x{n} [{PathName(n, false)} / {PathName(n, true)}]: values {tValues.MedianSeconds / batch * 1e6:F3} us, with vectors {tVectors.MedianSeconds / batch * 1e6:F3} us per matrix [cpu {tValues.MedianCpuSeconds / batch * 1e6:F3} / {tVectors.MedianCpuSeconds / batch * 1e6:F3}] (one-matrix API: {tValuesSingle.MedianSeconds / batch * 1e6:F3} / {tVectorsSingle.MedianSeconds / batch * 1e6:F3} us)");
        }

        return results;
    }

    /// <summary>The batched solver's path for the order at this process's width: "tridiagonal-512", "jacobi-256", "one-by-one".</summary>
    public static string PathName(int n, bool wantVectors)
    {
        var width = SimdWidths.Active;
        return BatchPlan.Choose(n, wantVectors, width) switch
        {
            BatchMethod.OneByOne => "one-by-one",
            var method => $"{(method == BatchMethod.Jacobi ? "jacobi" : "tridiagonal")}-{(width == SimdWidth.Bits512 ? 512 : 256)}",
        };
    }

    /// <summary>(X + X^H) / 2 with X of independent standard normal real and imaginary parts (Box-Muller).</summary>
    private static Complex[] RandomHermitian(int n, int batch, int seed)
    {
        var random = new Random(seed);
        double Normal() => Math.Sqrt(-2.0 * Math.Log(1.0 - random.NextDouble())) * Math.Cos(2.0 * Math.PI * random.NextDouble());
        var a = new Complex[batch * n * n];
        for (var b = 0; b < batch; b++)
        {
            var x = new Complex[n * n];
            for (var i = 0; i < n * n; i++)
            {
                x[i] = new Complex(Normal(), Normal());
            }

            for (var i = 0; i < n; i++)
            {
                for (var j = 0; j < n; j++)
                {
                    a[(b * n * n) + (i * n) + j] = 0.5 * (x[(i * n) + j] + Complex.Conjugate(x[(j * n) + i]));
                }
            }
        }

        return a;
    }
}
