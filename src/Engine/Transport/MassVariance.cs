namespace LatticeSweep.Engine.Transport;

/// <summary>
/// The mass-variance parameter of point-defect scattering.
/// One site: Gamma = sum_i f_i (1 - M_i / M)^2 with M = sum_i f_i M_i (Klemens 1955; Tamura,
/// Phys. Rev. B 27, 858 (1983), eq. 3). A basis of r sites: Gamma = (1/r) sum_s (M_s / M)^2 Gamma_s
/// with M_s the mean mass of site s and M the mean over the sites (Slack, Phys. Rev. 105, 829 (1957);
/// in this form in Morelli and Slack, High Thermal Conductivity Materials, Springer 2006, ch. 2).
/// </summary>
public static class MassVariance
{
    /// <summary>Gamma of one site from masses (amu) and fractions; fractions are normalised to sum 1.</summary>
    public static double OfSite(IReadOnlyList<MassFraction> composition)
    {
        ArgumentNullException.ThrowIfNull(composition);
        var total = composition.Sum(c => c.Fraction);
        if (composition.Count == 0 || !(total > 0))
        {
            return 0;
        }

        var mean = MeanMassAmu(composition);
        var gamma = 0.0;
        foreach (var c in composition)
        {
            var d = 1.0 - c.MassAmu / mean;
            gamma += c.Fraction / total * d * d;
        }

        return gamma;
    }

    /// <summary>Mean mass (amu) of a composition, fractions normalised.</summary>
    public static double MeanMassAmu(IReadOnlyList<MassFraction> composition)
    {
        ArgumentNullException.ThrowIfNull(composition);
        var total = composition.Sum(c => c.Fraction);
        return composition.Sum(c => c.Fraction * c.MassAmu) / total;
    }

    /// <summary>Gamma per atom of a basis from each site's mean mass (amu) and own Gamma.</summary>
    public static double OfBasis(IReadOnlyList<double> siteMeanMassesAmu, IReadOnlyList<double> siteGammas)
    {
        ArgumentNullException.ThrowIfNull(siteMeanMassesAmu);
        ArgumentNullException.ThrowIfNull(siteGammas);
        if (siteMeanMassesAmu.Count != siteGammas.Count || siteGammas.Count == 0)
        {
            throw new ArgumentException("one mean mass and one Gamma per site");
        }

        var mean = siteMeanMassesAmu.Average();
        var gamma = 0.0;
        for (var s = 0; s < siteGammas.Count; s++)
        {
            var ratio = siteMeanMassesAmu[s] / mean;
            gamma += ratio * ratio * siteGammas[s];
        }

        return gamma / siteGammas.Count;
    }
}
