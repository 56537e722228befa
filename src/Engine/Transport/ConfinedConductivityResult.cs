using System.Collections.Immutable;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Lattice thermal conductivity of a film or wire along its periodic directions from its own confined
/// modes (the group velocities of the branches of the real-space block), with the same scattering
/// channels as the boundary-scattering estimate of the point, so the two differ only in the modes.
/// </summary>
public sealed record ConfinedConductivityResult
{
    /// <summary>
    /// One row per temperature of the thermal table: KappaXx along the first periodic direction,
    /// KappaYy along the second in-plane direction (films; NaN for wires), KappaZz NaN, KappaWPerMK their mean.
    /// </summary>
    public required ImmutableArray<ConductivityRow> ByTemperature { get; init; }

    public required ConductivityRow AtReference { get; init; }

    /// <summary>"along a3" (a wire) or "in the a1-a2 plane" (a film).</summary>
    public required string Directions { get; init; }

    public required ScatteringShares SharesAtReference { get; init; }

    /// <summary>Volume the sum is divided by: atoms / sites per cell x the volume per cell, m^3.</summary>
    public required double VolumeM3 { get; init; }
}
