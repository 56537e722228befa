using System.Collections.Immutable;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// What occupies one basis site: a natural element (its isotopes in IUPAC abundances, from
/// <see cref="NaturalIsotopes"/>) or an explicit list of masses and fractions (enriched isotopes, an
/// alloy's components). Give one of <see cref="NaturalElement"/> and <see cref="Masses"/>.
/// The model's site mass should be the composition's mean mass (the virtual crystal).
/// </summary>
public sealed record SiteComposition
{
    public required string SiteLabel { get; init; }

    /// <summary>Element symbol whose natural isotopic composition occupies the site.</summary>
    public string? NaturalElement { get; init; }

    /// <summary>Masses (amu) and their fractions (summing to 1 within 1e-3).</summary>
    public ImmutableArray<MassFraction> Masses { get; init; } = [];
}

/// <summary>One kind of atom on a site: its mass in amu and the fraction of the site it occupies.</summary>
public sealed record MassFraction(double MassAmu, double Fraction);
