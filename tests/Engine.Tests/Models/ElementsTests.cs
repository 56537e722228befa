using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Models;

public sealed class ElementsTests
{
    // Expected values: IUPAC CIAAW "Standard atomic weights of the elements 2021" (Prohaska et al.,
    // Pure Appl. Chem. 94 (2022) 573), conventional values for interval elements (H, C, O, Si);
    // written from memory of that table.
    [Theory]
    [InlineData("H", 1, 1.008)]
    [InlineData("C", 6, 12.011)]
    [InlineData("O", 8, 15.999)]
    [InlineData("Si", 14, 28.085)]
    [InlineData("Fe", 26, 55.845)]
    [InlineData("Cu", 29, 63.546)]
    [InlineData("Ge", 32, 72.630)]
    [InlineData("Au", 79, 196.966570)]
    [InlineData("Pb", 82, 207.2)]
    [InlineData("U", 92, 238.02891)]
    public void StandardAtomicWeight_MatchesTheIupac2021Table(string symbol, int atomicNumber, double expectedAmu)
    {
        Tolerance.AssertClose(expectedAmu, Elements.StandardAtomicWeightAmu(symbol), 1e-12, 0.0, symbol);
        Assert.True(Elements.TryGetStandardAtomicWeightAmu(symbol, out double massAmu));
        Assert.Equal(Elements.StandardAtomicWeightAmu(symbol), massAmu);
        Assert.Equal(atomicNumber, Elements.AtomicNumber(symbol));
        Assert.True(Elements.HasStandardAtomicWeight(symbol));
    }

    [Fact]
    public void Table_RunsFromHydrogenToUranium_InOrderOfAtomicNumber()
    {
        Assert.True(Elements.Symbols.Count >= 92);
        Assert.Equal("H", Elements.Symbols[0]);
        Assert.Equal("U", Elements.Symbols[91]);
        Assert.Equal(Elements.Symbols.Count, Elements.Symbols.Distinct(StringComparer.Ordinal).Count());
        for (int i = 0; i < Elements.Symbols.Count; i++)
        {
            string symbol = Elements.Symbols[i];
            Assert.Equal(i + 1, Elements.AtomicNumber(symbol));
            Assert.True(Elements.StandardAtomicWeightAmu(symbol) > 0.0, symbol);
            Assert.Matches("^[A-Z][a-z]?$", symbol);
        }
    }

    [Fact]
    public void Weights_IncreaseWithAtomicNumber_ExceptTheKnownInversions()
    {
        // The pairs where the heavier element has the lower weight: Ar/K, Co/Ni, Te/I, Th/Pa (standard
        // periodic-table knowledge, from memory). Any other inversion points to a typo in the table.
        var inversions = new List<string>();
        for (int i = 1; i < Elements.Symbols.Count; i++)
        {
            if (Elements.StandardAtomicWeightAmu(Elements.Symbols[i]) <= Elements.StandardAtomicWeightAmu(Elements.Symbols[i - 1]))
            {
                inversions.Add($"{Elements.Symbols[i - 1]}/{Elements.Symbols[i]}");
            }
        }

        Assert.Equal(["Ar/K", "Co/Ni", "Te/I", "Th/Pa"], inversions);
    }

    [Theory]
    [InlineData("Tc", 97)]
    [InlineData("Pm", 145)]
    [InlineData("Po", 209)]
    [InlineData("Rn", 222)]
    [InlineData("Ac", 227)]
    public void ElementsWithoutStableIsotopes_CarryTheMassNumberOfTheLongestLivedIsotope(string symbol, double massNumber)
    {
        // Mass numbers as shown in brackets in the IUPAC periodic table (from memory).
        Assert.False(Elements.HasStandardAtomicWeight(symbol));
        Assert.Equal(massNumber, Elements.StandardAtomicWeightAmu(symbol));
    }

    [Fact]
    public void Symbols_AreTrimmed_ButCaseSensitive()
    {
        Assert.True(Elements.TryGetStandardAtomicWeightAmu("  Ge\t", out double germanium));
        Assert.Equal(72.630, germanium);
        Assert.False(Elements.TryGetStandardAtomicWeightAmu("ge", out _));
        Assert.False(Elements.TryGetStandardAtomicWeightAmu("CO", out _));
        Assert.False(Elements.TryGetStandardAtomicWeightAmu(null, out _));
        Assert.False(Elements.TryGetStandardAtomicWeightAmu("", out _));
    }

    [Fact]
    public void UnknownSymbol_ThrowsNamingTheNearestKnownSymbols()
    {
        var wrongCase = Assert.Throws<ArgumentException>(() => Elements.StandardAtomicWeightAmu("si"));
        var typo = Assert.Throws<ArgumentException>(() => Elements.StandardAtomicWeightAmu("Gx"));
        var unknown = Assert.Throws<ArgumentException>(() => Elements.AtomicNumber("Xyzzy"));

        Assert.Contains("'si'", wrongCase.Message, StringComparison.Ordinal);
        Assert.Contains("Nearest known symbol(s): Si.", wrongCase.Message, StringComparison.Ordinal);
        Assert.Contains("Ge", typo.Message, StringComparison.Ordinal);
        Assert.Contains("Ga", typo.Message, StringComparison.Ordinal);
        Assert.Contains("'Xyzzy'", unknown.Message, StringComparison.Ordinal);
        Assert.Equal("symbol", unknown.ParamName);
    }
}
