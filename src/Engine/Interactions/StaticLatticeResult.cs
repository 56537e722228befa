namespace LatticeSweep.Engine.Interactions;

/// <summary>
/// The static (motionless) lattice of a model built from potentials: its energy and pressure at the
/// geometry as given, and the isotropic scaling that minimises the energy. Energies per atom; the
/// pressure and bulk modulus only for 3D lattices (null otherwise).
/// </summary>
public sealed record StaticLatticeResult
{
    /// <summary>Static energy per atom at the given geometry, eV (the cohesive energy is its negative at the minimum).</summary>
    public required double EnergyEvPerAtom { get; init; }

    /// <summary>Static pressure -dE/dV at the given geometry, GPa (3D only).</summary>
    public double? PressureGpa { get; init; }

    /// <summary>Scale factor of the lattice at the static minimum (1 = as given).</summary>
    public required double EquilibriumScale { get; init; }

    /// <summary>Lattice constant at the static minimum, nm.</summary>
    public required double EquilibriumLatticeConstantNm { get; init; }

    /// <summary>Static energy per atom at the minimum, eV.</summary>
    public required double EquilibriumEnergyEvPerAtom { get; init; }

    /// <summary>Static bulk modulus V d2E/dV2 at the minimum, GPa (3D only).</summary>
    public double? EquilibriumBulkModulusGpa { get; init; }
}
