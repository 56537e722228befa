using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;
using MathNet.Numerics.LinearAlgebra;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// Bulk heat capacity between the T^3 region and the classical limit against converged mesh sums of the
/// models' closed-form dispersions. The linear tetrahedra just outside the long-wave box lifted the
/// acoustic cone's states (linear interpolation of a convex function): Cv was up to 8e-3 low there,
/// not monotonic in the mesh (5.9e-3 on 32^3 against 2.3e-3 on 16^3 for a simple cubic model).
/// </summary>
public class MidTemperatureBulkTests
{
    private static readonly double R = PhysicalConstants.GasConstantJPerMolK;
    private static readonly SolveOptions Thermal = new() { MeanSquareDisplacement = false, PartialDos = false };

    /// <summary>
    /// Scalar simple cubic (one branch): omega^2 = (4K/m) sum_i sin^2(q_i a / 2) (Ashcroft and Mermin
    /// ch. 22, the dynamical matrix of a Bravais lattice with nearest-neighbour springs), summed over a
    /// 120^3 mesh offset by half a step (no point at q = 0). Converged: 80^3, 120^3 and 160^3 sums agree
    /// within 1e-10 at these temperatures (NumPy, measured for this check).
    /// </summary>
    internal static double[] ScalarCubicReference(double[] temperatures)
    {
        const int m = 120;
        var w2 = 2 * Crystals.SpringNPerM / (Crystals.MassAmu * PhysicalConstants.AtomicMassKg);
        var cosines = Enumerable.Range(0, m).Select(i => Math.Cos((i + 0.5) / m * 2 * Math.PI)).ToArray();
        var sums = new double[temperatures.Length];
        for (var i = 0; i < m; i++)
        {
            for (var j = 0; j < m; j++)
            {
                for (var k = 0; k < m; k++)
                {
                    var omega = Math.Sqrt(w2 * (3 - cosines[i] - cosines[j] - cosines[k]));
                    for (var t = 0; t < temperatures.Length; t++)
                    {
                        sums[t] += ModeHeatCapacity.InBoltzmannUnits(omega, temperatures[t]);
                    }
                }
            }
        }

        return sums.Select(s => s * R / ((double)m * m * m)).ToArray();
    }

    /// <summary>
    /// Monatomic fcc with central nearest-neighbour springs K: D(q) = (K/m) sum over the 12 neighbours
    /// of (1 - cos q.delta) dhat dhat^T (Ashcroft and Mermin ch. 22, pair springs), eigenvalues per q,
    /// summed over an m^3 mesh of the primitive reciprocal cell offset by half a step (the sum over all
    /// branches is smooth away from q = 0, so it converges fast: 40^3 and 80^3 sums agree within 1e-9
    /// at 15-60 K, NumPy, measured for this check; colder needs a finer mesh, see the callers).
    /// </summary>
    internal static double[] FccReference(double[] temperatures, double aNm, int m = 40)
    {
        var a = aNm * 1e-9;
        var neighbours = new List<double[]>();
        foreach (var (x, y) in new[] { (1, 1), (1, -1), (-1, 1), (-1, -1) })
        {
            neighbours.Add([x, y, 0]);
            neighbours.Add([x, 0, y]);
            neighbours.Add([0, x, y]);
        }

        var k = Crystals.SpringNPerM / (Crystals.MassAmu * PhysicalConstants.AtomicMassKg);
        var sums = new double[temperatures.Length];
        var matrix = Matrix<double>.Build.Dense(3, 3);
        for (var i1 = 0; i1 < m; i1++)
        {
            for (var i2 = 0; i2 < m; i2++)
            {
                for (var i3 = 0; i3 < m; i3++)
                {
                    // q = sum f_i b_i with b_i = (2 pi / a) (-1, 1, 1) and permutations (the fcc reciprocal vectors).
                    var (f1, f2, f3) = ((i1 + 0.5) / m, (i2 + 0.5) / m, (i3 + 0.5) / m);
                    double[] q = [2 * Math.PI / a * (-f1 + f2 + f3), 2 * Math.PI / a * (f1 - f2 + f3), 2 * Math.PI / a * (f1 + f2 - f3)];
                    matrix.Clear();
                    foreach (var n in neighbours)
                    {
                        var phase = 1 - Math.Cos(((q[0] * n[0]) + (q[1] * n[1]) + (q[2] * n[2])) * a / 2);
                        for (var r = 0; r < 3; r++)
                        {
                            for (var c = 0; c < 3; c++)
                            {
                                matrix[r, c] += k * phase * n[r] * n[c] / 2;
                            }
                        }
                    }

                    foreach (var lambda in matrix.Evd(Symmetricity.Symmetric).EigenValues)
                    {
                        var omega = Math.Sqrt(Math.Max(lambda.Real, 0));
                        for (var t = 0; t < temperatures.Length; t++)
                        {
                            sums[t] += ModeHeatCapacity.InBoltzmannUnits(omega, temperatures[t]);
                        }
                    }
                }
            }
        }

        return sums.Select(s => s * R / ((double)m * m * m)).ToArray();
    }

    private static double WorstRelativeError(CrystalModel crystal, int mesh, double[] temperatures, double[] reference)
    {
        var rows = PhononSolver.Solve(crystal, BulkSample.Uniform(3, mesh), Thermal with { TemperaturesK = [.. temperatures] }).Thermal;
        return rows.Select((row, t) => Math.Abs((row.HeatCapacityJPerMolK / reference[t]) - 1)).Max();
    }

    [Fact]
    public void Scalar_simple_cubic_heat_capacity_between_the_T3_region_and_the_classical_limit_matches_a_converged_mesh_sum()
    {
        // hbar omega_max / kB = 459 K for this model: 20-90 K is where the bias was (0.04-0.2 of it).
        double[] temperatures = [20, 30, 40, 60, 90];
        var reference = ScalarCubicReference(temperatures);
        var worst = new[] { 8, 16, 32 }.Select(mesh => WorstRelativeError(Crystals.ScalarSimpleCubic(), mesh, temperatures, reference)).ToArray();

        // A model of the same shape (30 N/m, 25 amu) measured 1.6e-3, 1.2e-4, 6.7e-5 (was 8.4e-3, 2.3e-3, 5.9e-3).
        Assert.True(worst[1] < 3e-4, $"mesh 16: worst relative Cv error {worst[1]:E2}");
        Assert.True(worst[2] < 3e-4, $"mesh 32: worst relative Cv error {worst[2]:E2}");
        Assert.True(worst[0] > worst[1] && worst[1] > worst[2], $"falls with the mesh: {string.Join(", ", worst.Select(w => w.ToString("E2")))}");
    }

    [Fact]
    public void Fcc_central_spring_heat_capacity_between_the_T3_region_and_the_classical_limit_matches_a_converged_mesh_sum()
    {
        // Three acoustic branches with degeneracies along the symmetry lines (the sorted branches have
        // kinks there). For a model of the same shape (20 N/m, 30 amu) Cv was 4.8e-3 (16^3) and 7.3e-3
        // (32^3) low at 20 K; now 1.4e-4 and 6.3e-5.
        double[] temperatures = [15, 20, 30, 40, 60];
        var reference = FccReference(temperatures, 0.4);
        var worst = new[] { 16, 32 }.Select(mesh => WorstRelativeError(Crystals.FccCentral(), mesh, temperatures, reference)).ToArray();

        Assert.True(worst[0] < 5e-4, $"mesh 16: worst relative Cv error {worst[0]:E2}");
        Assert.True(worst[1] < 5e-4, $"mesh 32: worst relative Cv error {worst[1]:E2}");
        Assert.True(worst[1] < worst[0], $"falls with the mesh: {worst[0]:E2}, {worst[1]:E2}");
    }
}
