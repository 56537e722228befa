namespace LatticeSweep.Engine.QuasiHarmonic;

/// <summary>
/// The quasi-harmonic state at one temperature: the volume that minimises F = E_static + F_vib and
/// what follows from it. Every number is null where the approximation breaks down at this
/// temperature, and <see cref="Breakdown"/> says why (null when it holds). Per mole of atoms. The
/// isothermal modulus is V d2F/dV2 per dimension: GPa in 3D, N/m for a sheet, N for a chain.
/// </summary>
public sealed record ExpansionRow
{
    public required double TemperatureK { get; init; }

    /// <summary>Lattice constant at the minimum of F, nm.</summary>
    public double? LatticeConstantNm { get; init; }

    /// <summary>V(T) / V at the static minimum.</summary>
    public double? VolumeRatio { get; init; }

    /// <summary>Linear thermal expansion coefficient alpha_V / d, 1/K.</summary>
    public double? LinearExpansionPerK { get; init; }

    /// <summary>Volumetric (areal, linear) thermal expansion coefficient (1/V) dV/dT, 1/K.</summary>
    public double? VolumeExpansionPerK { get; init; }

    public double? IsothermalBulkModulusGpa { get; init; }
    public double? IsothermalBulkModulusNPerM { get; init; }
    public double? IsothermalBulkModulusN { get; init; }

    /// <summary>Heat capacity at constant volume, at the volume V(T), J/(mol K).</summary>
    public double? CvJPerMolK { get; init; }

    /// <summary>Cp = Cv + alpha_V^2 B_T V T, J/(mol K).</summary>
    public double? CpJPerMolK { get; init; }

    /// <summary>Thermal Grueneisen parameter V (dS/dV)_T / Cv: the Cv-weighted mean of the mode parameters.</summary>
    public double? Grueneisen { get; init; }

    /// <summary>F = E_static + F_vib at the minimum, J/mol.</summary>
    public double? FreeEnergyJPerMol { get; init; }

    /// <summary>Why the approximation fails at this temperature (no minimum of F, runaway expansion); null when it holds.</summary>
    public string? Breakdown { get; init; }
}
