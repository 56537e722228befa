using System.Collections.Immutable;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Lattice thermal-conductivity estimates of one model: kinetic theory in the relaxation-time
/// approximation against temperature, the Cahill-Pohl-Watson minimum, Slack's estimate, the share of
/// each scattering channel, the mesh convergence and the inputs the channels actually used. Model
/// estimates for ranking candidates, not design values (docs/conductivity.md).
/// </summary>
public sealed record ConductivityResult
{
    /// <summary>One row per temperature of the thermal table.</summary>
    public required ImmutableArray<ConductivityRow> ByTemperature { get; init; }

    public required double ReferenceTemperatureK { get; init; }

    /// <summary>Conductivity at the reference temperature.</summary>
    public required ConductivityRow AtReference { get; init; }

    /// <summary>False when the harmonic spectrum has imaginary modes: every kappa is NaN then.</summary>
    public required bool Stable { get; init; }

    /// <summary>"finite" (exact Born-von Karman modes) or "bulk" (Gamma-centred mesh).</summary>
    public required string SampleKind { get; init; }

    /// <summary>Wave vectors of the sum per direction (cells of a finite crystal, or the bulk mesh).</summary>
    public required ImmutableArray<int> Mesh { get; init; }

    /// <summary>Bulk: the half-density mesh of the convergence check; empty for finite crystals or when not asked.</summary>
    public required ImmutableArray<int> ConvergenceMesh { get; init; }

    /// <summary>|kappa(mesh) - kappa(half mesh)| / kappa(mesh) at the reference temperature; NaN when not computed (finite crystals are exact sums).</summary>
    public required double MeshRelativeChange { get; init; }

    /// <summary>Cahill-Pohl-Watson minimum conductivity at the reference temperature (3D lattices; NaN otherwise).</summary>
    public required double KappaMinWPerMK { get; init; }

    /// <summary>Its high-temperature limit.</summary>
    public required double KappaMinHighTemperatureWPerMK { get; init; }

    /// <summary>Slack's Umklapp-limited estimate at T = theta_a (3D lattices with a Grueneisen parameter; NaN otherwise).</summary>
    public required double SlackKappaAtDebyeTemperatureWPerMK { get; init; }

    /// <summary>Slack's estimate at the reference temperature (scales as 1/T).</summary>
    public required double SlackKappaAtReferenceWPerMK { get; init; }

    public required ScatteringShares SharesAtReference { get; init; }

    /// <summary>Acoustic Debye temperature theta_a from the direction-averaged sound speeds (one acoustic set per primitive cell).</summary>
    public required double AcousticDebyeTemperatureK { get; init; }

    /// <summary>Debye average v_D of the acoustic branches, v_D^-d = mean over branches and directions of v^-d.</summary>
    public required double DebyeAverageSoundSpeedMPerS { get; init; }

    /// <summary>Direction-averaged sound speed of each acoustic branch, slowest first.</summary>
    public required ImmutableArray<double> MeanSoundSpeedsMPerS { get; init; }

    /// <summary>Effective boundary length L_eff used (NaN when the boundary channel is off).</summary>
    public required double BoundaryLengthNm { get; init; }

    /// <summary>Mass-variance Gamma used (NaN when the point-defect channel is off).</summary>
    public required double MassVarianceGamma { get; init; }

    /// <summary>theta and v of the Umklapp rate (NaN when the channel is off).</summary>
    public required double UmklappDebyeTemperatureK { get; init; }
    public required double UmklappSoundSpeedMPerS { get; init; }

    /// <summary>Volume per primitive cell the sum is divided by, m^3 (2D: area x thickness; 1D: length x cross-section).</summary>
    public required double VolumePerCellM3 { get; init; }

    /// <summary>The Grueneisen parameter the Umklapp rate and Slack's estimate used (null: none).</summary>
    public double? GrueneisenParameter { get; init; }

    /// <summary>Where it came from: "given" (the options) or "quasi_harmonic" (the thermal parameter at the reference temperature).</summary>
    public string? GrueneisenSource { get; init; }

    /// <summary>Cumulative kappa against mean free path at the reference temperature; empty unless asked (or kappa is not finite).</summary>
    public required ImmutableArray<MeanFreePathRow> CumulativeByMeanFreePath { get; init; }
}
