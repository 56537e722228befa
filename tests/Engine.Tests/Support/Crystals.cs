using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Engine.Tests.Support;

/// <summary>Invented demo models shared by the tests (numbers chosen for round arithmetic, not materials).</summary>
internal static class Crystals
{
    public const double SpringNPerM = 10.0;
    public const double MassAmu = 20.0;
    public const double SpacingNm = 0.3;

    /// <summary>Monatomic scalar chain: one site, nearest-neighbour spring K.</summary>
    public static CrystalModel ScalarChain(double k = SpringNPerM, double m = MassAmu) =>
        CrystalModel.Create(Lattice.Chain(SpacingNm), [new Site("A", "A", Vec3.Zero, m)], [new ShellSpring("A", "A", 1, k)],
            degreesOfFreedom: DegreesOfFreedom.Scalar);

    /// <summary>Diatomic scalar chain: masses m and M alternating, one spring constant.</summary>
    public static CrystalModel DiatomicChain(double m, double bigM, double k = SpringNPerM) =>
        CrystalModel.Create(
            Lattice.Chain(2 * SpacingNm),
            [new Site("a", "a", Vec3.Zero, m), new Site("b", "b", new Vec3(0.5, 0, 0), bigM)],
            [new ShellSpring("a", "b", 1, k)],
            degreesOfFreedom: DegreesOfFreedom.Scalar);

    public static CrystalModel ScalarSquare(double k = SpringNPerM) =>
        CrystalModel.Create(Lattice.Square(SpacingNm), [new Site("A", "A", Vec3.Zero, MassAmu)], [new ShellSpring("A", "A", 1, k)],
            degreesOfFreedom: DegreesOfFreedom.Scalar);

    public static CrystalModel ScalarSimpleCubic(double k = SpringNPerM) =>
        CrystalModel.Create(Lattice.SimpleCubic(SpacingNm), [new Site("A", "A", Vec3.Zero, MassAmu)], [new ShellSpring("A", "A", 1, k)],
            degreesOfFreedom: DegreesOfFreedom.Scalar);

    /// <summary>3D fcc monatomic with central nearest-neighbour springs.</summary>
    public static CrystalModel FccCentral(double k = SpringNPerM, double aNm = 0.4) =>
        CrystalModel.Create(Lattice.FaceCentredCubic(aNm), [new Site("A", "A", Vec3.Zero, MassAmu)], [new ShellSpring("A", "A", 1, k)]);

    /// <summary>Rock-salt-like two-site fcc cell (invented masses and springs).</summary>
    public static CrystalModel RockSalt(double m1 = 23.0, double m2 = 35.0, double k1 = 15.0, double k2 = 3.0) =>
        CrystalModel.Create(
            Lattice.FaceCentredCubic(0.56),
            [new Site("P", "P", Vec3.Zero, m1), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), m2)],
            [new ShellSpring("P", "Q", 1, k1, 0.2 * k1), new ShellSpring("P", "P", 1, k2), new ShellSpring("Q", "Q", 1, k2)]);

    /// <summary>omega_0 = sqrt(K / m) in rad/s.</summary>
    public static double Omega0(double k = SpringNPerM, double mAmu = MassAmu) =>
        Math.Sqrt(k / (mAmu * Units.PhysicalConstants.AtomicMassKg));

    public static double Thz(double omega) => omega / (2 * Math.PI) / 1e12;
}
