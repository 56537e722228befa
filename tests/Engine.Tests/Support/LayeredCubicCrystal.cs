using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Engine.Tests.Support;

/// <summary>
/// The invented layered crystal of the layered-crystal tests: one site on a simple cubic lattice, bonds along the axes
/// only, the shear across the z layers (0.01 N/m) hundreds of times weaker than within them (4-35 N/m); random audit
/// case 45 of seed 2512 with its z shear made 0.01 N/m. With bonds along the axes its dynamical matrix is diagonal.
/// </summary>
internal static class LayeredCubicCrystal
{
    public const double ConstantNm = 0.4596;
    public const double MassAmu = 3.8724;
    public const double ShearAcrossNPerM = 0.01;

    /// <summary>Per polarisation x, y, z: the springs (N/m) its motion meets along bonds x, y, z (longitudinal along its own axis).</summary>
    public static readonly double[][] Springs = [[18.5731, 9.3274, ShearAcrossNPerM], [4.3483, 34.8232, ShearAcrossNPerM], [4.3483, 9.3274, 2.2579]];

    /// <summary>The crystal itself.</summary>
    public static CrystalModel Model() => CrystalModel.Create(
        Lattice.SimpleCubic(ConstantNm),
        [new Site("S0", "S0", Vec3.Zero, MassAmu)],
        bondSprings:
        [
            new BondSpring("S0", "S0", new IntVec3(1, 0, 0), 18.5731, 4.3483),
            new BondSpring("S0", "S0", new IntVec3(0, 1, 0), 34.8232, 9.3274),
            new BondSpring("S0", "S0", new IntVec3(0, 0, 1), 2.2579, ShearAcrossNPerM),
        ]);
}
