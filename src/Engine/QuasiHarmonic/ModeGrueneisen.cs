using System.Collections.Immutable;
using System.Numerics;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.QuasiHarmonic;

/// <summary>
/// Mode Grueneisen parameters gamma = -d ln omega / d ln V = -(V / 2 omega^2) e^H (dD/dV) e along a
/// dispersion path (first-order perturbation of the eigenvalue; Hellmann-Feynman), with dD/dV a
/// central difference of D at the same reduced wave vector on the lattice scaled by 1 +- 1e-4. Within
/// a degenerate set the derivative is diagonalised in the set, so crossings and degeneracies give
/// well-defined values (common practice, no source). Null at omega = 0.
/// </summary>
internal static class ModeGrueneisen
{
    private const double Step = 1e-4;

    public static ImmutableArray<DispersionRow> Attach(CrystalModel model, ImmutableArray<DispersionRow> rows)
    {
        if (rows.IsDefaultOrEmpty)
        {
            return rows;
        }

        var centre = new ModeSolver(new DynamicalMatrix(CompiledCrystal.From(model)));
        var plus = new DynamicalMatrix(CompiledCrystal.From(model.Scaled(1 + Step, scaleCutoffs: true)));
        var minus = new DynamicalMatrix(CompiledCrystal.From(model.Scaled(1 - Step, scaleCutoffs: true)));
        var d = model.Lattice.Dimension;
        var v = model.Lattice.CellMeasure;
        var dV = v * (Math.Pow(1 + Step, d) - Math.Pow(1 - Step, d));
        var n = centre.Size;
        var (dPlus, dMinus, derivative) = (new Complex[n * n], new Complex[n * n], new Complex[n * n]);
        var gammas = new Dictionary<(int, int), double?>();

        // omega^2 below this is zero (an acoustic mode at q = 0); a scale from the whole path, since at
        // q = 0 every mode of a one-site cell is acoustic.
        var scale = Math.Pow(2e12 * Math.PI * rows.Max(r => r.FrequencyThz), 2);
        foreach (var point in rows.GroupBy(r => r.PathIndex))
        {
            var first = point.First();
            var q = new Vec3(first.QxPerNm, first.QyPerNm, first.QzPerNm) * 1e9;
            centre.SolveWithVectors(q);
            plus.Build(q / (1 + Step), dPlus);
            minus.Build(q / (1 - Step), dMinus);
            for (var i = 0; i < n * n; i++)
            {
                derivative[i] = (dPlus[i] - dMinus[i]) / dV;
            }

            var values = centre.Values;
            var top = Math.Max(Math.Abs(values[^1]), scale);
            var start = 0;
            while (start < n)
            {
                var end = start + 1;
                while (end < n && Math.Abs(values[end] - values[start]) <= 1e-8 * top)
                {
                    end++;
                }

                var projected = Projected(centre.Vectors, derivative, n, start, end);
                for (var k = start; k < end; k++)
                {
                    gammas[(point.Key, k)] = values[k] > 1e-12 * top ? -v * projected[k - start] / (2 * values[k]) : null;
                }

                start = end;
            }
        }

        return [.. rows.Select(r => r with { ModeGrueneisen = gammas.GetValueOrDefault((r.PathIndex, r.Branch)) })];
    }

    /// <summary>Eigenvalues (ascending) of E^H M E for the eigenvector columns start..end-1.</summary>
    private static double[] Projected(Complex[] vectors, Complex[] m, int n, int start, int end)
    {
        var g = end - start;
        var p = new Complex[g * g];
        for (var a = 0; a < g; a++)
        {
            for (var b = 0; b < g; b++)
            {
                var sum = Complex.Zero;
                for (var i = 0; i < n; i++)
                {
                    var row = Complex.Zero;
                    for (var j = 0; j < n; j++)
                    {
                        row += m[(i * n) + j] * vectors[(j * n) + start + b];
                    }

                    sum += Complex.Conjugate(vectors[(i * n) + start + a]) * row;
                }

                p[(a * g) + b] = sum;
            }
        }

        DynamicalMatrix.MakeHermitian(p, g);
        var values = new double[g];
        HermitianEigenSolver.Eigenvalues(p, g, values);
        return values;
    }
}
