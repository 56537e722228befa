using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Elastic;

/// <summary>
/// Central springs for a monatomic cubic crystal fitted to C11, C12, C44 by the method of long
/// waves: for central pair springs K_s on neighbour vectors R,
/// C_abcd = (1 / 2 Omega) sum_R K_s R_a R_b R_c R_d / |R|^2 (Born and Huang, Dynamical Theory of
/// Crystal Lattices, ch. 3, method of long waves; from memory). The
/// constants are linear in the springs, so the fit is linear least squares. Central pair forces
/// always give the Cauchy relation C12 = C44; the residual says how far the data are from it.
/// </summary>
public static class ElasticSpringFit
{
    public static ElasticFitResult Fit(LatticeKind cubicKind, double constantNm, double massAmu, CubicElasticConstants constants, bool includeNextNearest)
    {
        ArgumentNullException.ThrowIfNull(constants);
        var lattice = CubicLattice(cubicKind, constantNm);
        Guard.PositiveFinite(massAmu, "model.elastic.mass_amu", "the atomic mass");
        Guard.PositiveFinite(constants.C11Gpa, "model.elastic.c11_gpa", "C11");
        Guard.Finite(constants.C12Gpa, "model.elastic.c12_gpa", "C12");
        Guard.PositiveFinite(constants.C44Gpa, "model.elastic.c44_gpa", "C44");

        var shells = includeNextNearest ? 2 : 1;
        var design = new double[3, shells]; // rows C11, C12, C44 (Pa per N/m of spring)
        var volume = lattice.CellMeasure;
        for (var s = 0; s < shells; s++)
        {
            foreach (var r in ShellVectors(lattice, s + 1))
            {
                var r2 = r.Dot(r);
                design[0, s] += r.X * r.X * r.X * r.X / r2 / (2 * volume);
                design[1, s] += r.X * r.X * r.Y * r.Y / r2 / (2 * volume);
                design[2, s] += r.X * r.Y * r.X * r.Y / r2 / (2 * volume);
            }
        }

        var target = new[] { constants.C11Gpa, constants.C12Gpa, constants.C44Gpa }.Select(c => c * PhysicalConstants.PascalPerGpa).ToArray();
        var springs = LeastSquares(design, target, shells);
        var reproduced = new double[3];
        for (var row = 0; row < 3; row++)
        {
            for (var s = 0; s < shells; s++)
            {
                reproduced[row] += design[row, s] * springs[s];
            }
        }

        var residual = Math.Sqrt(Enumerable.Range(0, 3).Sum(i => Math.Pow(reproduced[i] - target[i], 2)))
            / Math.Sqrt(target.Sum(t => t * t));
        var modelConstants = new CubicElasticConstants(reproduced[0] / 1e9, reproduced[1] / 1e9, reproduced[2] / 1e9);
        var density = massAmu * PhysicalConstants.AtomicMassKg / volume;
        return new ElasticFitResult(springs[0], shells > 1 ? springs[1] : 0.0, constants, modelConstants, residual, density,
            [.. ChristoffelSpeeds(modelConstants, density)])
        {
            GivenSoundSpeeds = [.. ChristoffelSpeeds(constants, density)],
        };
    }

    /// <summary>The fitted model itself: one site, central springs on one or two shells.</summary>
    public static CrystalModel BuildModel(LatticeKind cubicKind, double constantNm, double massAmu, CubicElasticConstants constants, bool includeNextNearest, DegreesOfFreedom degreesOfFreedom, out ElasticFitResult fit)
    {
        fit = Fit(cubicKind, constantNm, massAmu, constants, includeNextNearest);
        var lattice = CubicLattice(cubicKind, constantNm);
        var springs = new List<ShellSpring> { new("X", "X", 1, fit.NearestNPerM) };
        if (includeNextNearest)
        {
            springs.Add(new ShellSpring("X", "X", 2, fit.NextNearestNPerM));
        }

        return CrystalModel.Create(lattice, [new Site("X", "X", Vec3.Zero, massAmu)], springs, degreesOfFreedom: degreesOfFreedom) with { ElasticFit = fit };
    }

    /// <summary>
    /// Sound speeds of a cubic crystal along [100], [110], [111] from the Christoffel equation
    /// (Kittel, Introduction to Solid State Physics, ch. 3, eqs. for waves in cubic crystals).
    /// </summary>
    public static IEnumerable<SoundSpeed> ChristoffelSpeeds(CubicElasticConstants c, double densityKgPerM3)
    {
        var (c11, c12, c44) = (c.C11Gpa * 1e9, c.C12Gpa * 1e9, c.C44Gpa * 1e9);
        double V(double modulus) => modulus > 0 ? Math.Sqrt(modulus / densityKgPerM3) : 0;
        yield return Sorted("[100]", V(c44), V(c44), V(c11));
        yield return Sorted("[110]", V(c44), V((c11 - c12) / 2), V((c11 + c12 + 2 * c44) / 2));
        yield return Sorted("[111]", V((c11 - c12 + c44) / 3), V((c11 - c12 + c44) / 3), V((c11 + 2 * c12 + 4 * c44) / 3));
    }

    private static SoundSpeed Sorted(string direction, params double[] speeds)
    {
        Array.Sort(speeds);
        return new SoundSpeed(direction, speeds);
    }

    private static Lattice CubicLattice(LatticeKind kind, double constantNm) => kind switch
    {
        LatticeKind.SimpleCubic => Lattice.SimpleCubic(constantNm),
        LatticeKind.BodyCentredCubic => Lattice.BodyCentredCubic(constantNm),
        LatticeKind.FaceCentredCubic => Lattice.FaceCentredCubic(constantNm),
        _ => throw Guard.Single(ModelProblemKind.NotSupported, "model.elastic.lattice", $"springs from elastic constants need a cubic lattice (sc, bcc or fcc), not {kind}"),
    };

    private static List<Vec3> ShellVectors(Lattice lattice, int shell)
    {
        var found = Spectrum.NeighbourShells.Find(lattice, [Vec3.Zero], 0, _ => true, shell, 1e-15)
            ?? throw Guard.Single(ModelProblemKind.NoNeighbourShell, "model.elastic", $"shell {shell} not found");
        return found.Select(f => lattice.ToCartesianM(f.Offset.AsVec3())).ToList();
    }

    private static double[] LeastSquares(double[,] a, double[] b, int columns)
    {
        // Normal equations for at most two unknowns: exact and well conditioned here.
        var ata = new double[columns, columns];
        var atb = new double[columns];
        for (var i = 0; i < 3; i++)
        {
            for (var j = 0; j < columns; j++)
            {
                atb[j] += a[i, j] * b[i];
                for (var k = 0; k < columns; k++)
                {
                    ata[j, k] += a[i, j] * a[i, k];
                }
            }
        }

        if (columns == 1)
        {
            return [atb[0] / ata[0, 0]];
        }

        var det = ata[0, 0] * ata[1, 1] - ata[0, 1] * ata[1, 0];
        if (Math.Abs(det) < 1e-30 * Math.Abs(ata[0, 0] * ata[1, 1]))
        {
            throw Guard.Single(ModelProblemKind.NotSupported, "model.elastic.next_nearest", "the two shells cannot be told apart by C11, C12, C44 on this lattice; fit nearest neighbours only");
        }

        return
        [
            (atb[0] * ata[1, 1] - ata[0, 1] * atb[1]) / det,
            (ata[0, 0] * atb[1] - ata[1, 0] * atb[0]) / det,
        ];
    }
}
