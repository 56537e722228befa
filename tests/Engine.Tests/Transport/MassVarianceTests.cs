using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Engine.Tests.Transport;

/// <summary>Mass-variance Gamma from natural isotopic compositions and for compounds.</summary>
public class MassVarianceTests
{
    private static double Natural(string symbol)
    {
        Assert.True(NaturalIsotopes.TryGet(symbol, out var isotopes), symbol);
        return MassVariance.OfSite(NaturalIsotopes.Composition(isotopes));
    }

    [Theory]
    // Tamura, Phys. Rev. B 27, 858 (1983), Table I: g = 2.01e-4 for Si and 5.87e-4 for Ge (values
    // from memory). Natural compositions change a little between IUPAC revisions, hence 1%.
    [InlineData("Si", 2.01e-4)]
    [InlineData("Ge", 5.87e-4)]
    public void Natural_isotope_mixture_gives_the_published_Gamma(string symbol, double published)
    {
        Approx.Equal(published, Natural(symbol), 0.01, $"Gamma of natural {symbol}");
    }

    [Fact]
    public void Monoisotopic_elements_scatter_nothing()
    {
        Assert.Equal(0.0, Natural("Al"));
        Assert.Equal(0.0, Natural("As"));
    }

    [Fact]
    public void Every_table_entry_sums_to_one_and_reproduces_the_standard_atomic_weight()
    {
        // Internal consistency of two independent tables: IUPAC isotopic compositions x AME masses must
        // give the IUPAC standard atomic weight (CIAAW 2021, in Elements) to the precision of the
        // abundances (2e-4 relative covers the conventional values of interval elements B, C, N, O, Mg, Si).
        foreach (var symbol in NaturalIsotopes.Symbols)
        {
            Assert.True(NaturalIsotopes.TryGet(symbol, out var isotopes));
            Approx.Equal(1.0, isotopes.Sum(i => i.Abundance), 1e-4, $"{symbol} abundances");
            Assert.True(Elements.TryGetStandardAtomicWeightAmu(symbol, out var weight));
            Approx.Equal(weight, MassVariance.MeanMassAmu(NaturalIsotopes.Composition(isotopes)), 2e-4, $"{symbol} mean mass");
            Assert.All(isotopes, i => Assert.InRange(i.MassAmu, i.MassNumber - 0.1, i.MassNumber + 0.1));
        }
    }

    [Fact]
    public void Two_mass_mixture_has_the_closed_form_Gamma()
    {
        // f (1 - f) (dM / M)^2 for two masses (Klemens 1955; algebra).
        const double f = 0.3, m1 = 10, m2 = 14;
        var mean = (1 - f) * m1 + f * m2;
        var expected = f * (1 - f) * Math.Pow((m2 - m1) / mean, 2);
        Approx.Equal(expected, MassVariance.OfSite([new(m1, 1 - f), new(m2, f)]), 1e-12, "two-mass Gamma");
    }

    [Fact]
    public void Compound_Gamma_weights_each_site_by_its_mass_squared()
    {
        // Slack, Phys. Rev. 105, 829 (1957): Gamma = (1/r) sum_s (M_s / M)^2 Gamma_s. With one pure site
        // of mass 2M0 and one disordered site of mass M0: M = 1.5 M0, Gamma = (1/2)(1/1.5)^2 Gamma_2.
        Approx.Equal(0.5 / 2.25 * 1e-3, MassVariance.OfBasis([40.0, 20.0], [0.0, 1e-3]), 1e-12, "compound Gamma");
    }
}
