using System.Collections.Frozen;
using System.Collections.Immutable;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Natural isotopic compositions of a few elements common in thermal screening, for the
/// point-defect (isotope) scattering channel.
/// <para>
/// Sources: abundances are IUPAC's representative isotopic compositions (Meija et al., "Isotopic
/// compositions of the elements 2013", Pure Appl. Chem. 88, 293-306 (2016)); isotope masses are from
/// the Atomic Mass Evaluation AME2020 (Wang et al., Chinese Phys. C 45, 030003 (2021)). The numbers
/// were written from memory of those tables, not copied from them. Two checks keep them honest (see
/// the tests): the abundances of each element sum to 1, and the mean mass reproduces the IUPAC
/// standard atomic weight of <see cref="Models.Elements"/> to 2e-4. Natural samples vary (C, B, O, Mg
/// in particular); give explicit masses and fractions for a measured or enriched composition.
/// </para>
/// </summary>
public static class NaturalIsotopes
{
    private static readonly FrozenDictionary<string, ImmutableArray<Isotope>> Table = new Dictionary<string, ImmutableArray<Isotope>>(StringComparer.Ordinal)
    {
        ["B"] = [new(10, 10.01293695, 0.199), new(11, 11.00930536, 0.801)],
        ["C"] = [new(12, 12.0, 0.9893), new(13, 13.00335484, 0.0107)],
        ["N"] = [new(14, 14.00307400, 0.99636), new(15, 15.00010890, 0.00364)],
        ["O"] = [new(16, 15.99491462, 0.99757), new(17, 16.99913176, 0.00038), new(18, 17.99915961, 0.00205)],
        ["Mg"] = [new(24, 23.98504170, 0.7899), new(25, 24.98583698, 0.1000), new(26, 25.98259297, 0.1101)],
        ["Al"] = [new(27, 26.98153841, 1.0)],
        ["Si"] = [new(28, 27.97692653, 0.92223), new(29, 28.97649466, 0.04685), new(30, 29.97377014, 0.03092)],
        ["Cu"] = [new(63, 62.92959772, 0.6915), new(65, 64.92778970, 0.3085)],
        ["Zn"] = [new(64, 63.92914201, 0.4917), new(66, 65.92603381, 0.2773), new(67, 66.92712775, 0.0404), new(68, 67.92484455, 0.1845), new(70, 69.92531920, 0.0061)],
        ["Ga"] = [new(69, 68.92557350, 0.60108), new(71, 70.92470258, 0.39892)],
        ["Ge"] = [new(70, 69.92424875, 0.2052), new(72, 71.92207583, 0.2745), new(73, 72.92345896, 0.0776), new(74, 73.92117776, 0.3652), new(76, 75.92140273, 0.0775)],
        ["As"] = [new(75, 74.92159457, 1.0)],
        ["Ag"] = [new(107, 106.9050916, 0.51839), new(109, 108.9047553, 0.48161)],
    }.ToFrozenDictionary(StringComparer.Ordinal);

    /// <summary>Symbols of the elements in the table.</summary>
    public static IReadOnlyList<string> Symbols { get; } = Table.Keys.Order(StringComparer.Ordinal).ToArray();

    /// <summary>The natural isotopes of an element (exact-case symbol), or false when the table does not have it.</summary>
    public static bool TryGet(string? symbol, out ImmutableArray<Isotope> isotopes)
    {
        if (symbol is not null && Table.TryGetValue(symbol.Trim(), out isotopes))
        {
            return true;
        }

        isotopes = [];
        return false;
    }

    /// <summary>The natural composition as masses and fractions.</summary>
    public static ImmutableArray<MassFraction> Composition(ImmutableArray<Isotope> isotopes) =>
        [.. isotopes.Select(i => new MassFraction(i.MassAmu, i.Abundance))];
}
