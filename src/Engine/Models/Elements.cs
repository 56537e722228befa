using System.Collections.Frozen;

namespace LatticeSweep.Engine.Models;

/// <summary>
/// Standard atomic weights (amu = Da) of hydrogen (Z = 1) to uranium (Z = 92), to resolve a basis site
/// given as an element symbol.
/// <para>
/// Source: IUPAC Commission on Isotopic Abundances and Atomic Weights (CIAAW), "Standard atomic weights
/// of the elements 2021", T. Prohaska et al., Pure Appl. Chem. 94 (2022) 573-600. Where the standard
/// weight is an interval (H, Li, B, C, N, O, Mg, Si, S, Cl, Ar, Br, Tl, Pb) the table gives IUPAC's
/// conventional value; elsewhere the standard value without its uncertainty. Tc, Pm and Po to Ac have no
/// stable isotope and no standard weight: they carry the mass number of their longest-lived isotope
/// (see <see cref="HasStandardAtomicWeight"/>). The values were written from memory of that table and
/// cross-checked against an independent general-purpose element table (differences only where IUPAC
/// revised a value after that table was made); check a value against the publication before relying on
/// its last digit. Natural samples of interval elements vary within the interval; give an explicit
/// mass for isotope-engineered or unusual material.
/// </para>
/// </summary>
public static class Elements
{
    private static readonly Entry[] Table =
    [
        new("H", 1.008), new("He", 4.002602), new("Li", 6.94), new("Be", 9.0121831), new("B", 10.81),
        new("C", 12.011), new("N", 14.007), new("O", 15.999), new("F", 18.998403162), new("Ne", 20.1797),
        new("Na", 22.98976928), new("Mg", 24.305), new("Al", 26.9815384), new("Si", 28.085), new("P", 30.973761998),
        new("S", 32.06), new("Cl", 35.45), new("Ar", 39.95), new("K", 39.0983), new("Ca", 40.078),
        new("Sc", 44.955907), new("Ti", 47.867), new("V", 50.9415), new("Cr", 51.9961), new("Mn", 54.938043),
        new("Fe", 55.845), new("Co", 58.933194), new("Ni", 58.6934), new("Cu", 63.546), new("Zn", 65.38),
        new("Ga", 69.723), new("Ge", 72.630), new("As", 74.921595), new("Se", 78.971), new("Br", 79.904),
        new("Kr", 83.798), new("Rb", 85.4678), new("Sr", 87.62), new("Y", 88.905838), new("Zr", 91.222),
        new("Nb", 92.90637), new("Mo", 95.95), new("Tc", 97, IsMassNumber: true), new("Ru", 101.07), new("Rh", 102.90549),
        new("Pd", 106.42), new("Ag", 107.8682), new("Cd", 112.414), new("In", 114.818), new("Sn", 118.710),
        new("Sb", 121.760), new("Te", 127.60), new("I", 126.90447), new("Xe", 131.293), new("Cs", 132.90545196),
        new("Ba", 137.327), new("La", 138.90547), new("Ce", 140.116), new("Pr", 140.90766), new("Nd", 144.242),
        new("Pm", 145, IsMassNumber: true), new("Sm", 150.36), new("Eu", 151.964), new("Gd", 157.249), new("Tb", 158.925354),
        new("Dy", 162.500), new("Ho", 164.930329), new("Er", 167.259), new("Tm", 168.934219), new("Yb", 173.045),
        new("Lu", 174.96669), new("Hf", 178.486), new("Ta", 180.94788), new("W", 183.84), new("Re", 186.207),
        new("Os", 190.23), new("Ir", 192.217), new("Pt", 195.084), new("Au", 196.966570), new("Hg", 200.592),
        new("Tl", 204.38), new("Pb", 207.2), new("Bi", 208.98040), new("Po", 209, IsMassNumber: true), new("At", 210, IsMassNumber: true),
        new("Rn", 222, IsMassNumber: true), new("Fr", 223, IsMassNumber: true), new("Ra", 226, IsMassNumber: true),
        new("Ac", 227, IsMassNumber: true), new("Th", 232.0377),
        new("Pa", 231.03588), new("U", 238.02891),
    ];

    // Z - 1 by symbol; symbols are case-sensitive ("Co" is cobalt, "CO" is not an element).
    private static readonly FrozenDictionary<string, int> IndexBySymbol =
        Table.Select((entry, index) => KeyValuePair.Create(entry.Symbol, index)).ToFrozenDictionary(StringComparer.Ordinal);

    /// <summary>Element symbols in order of atomic number, "H" first.</summary>
    public static IReadOnlyList<string> Symbols { get; } = Array.AsReadOnly(Table.Select(entry => entry.Symbol).ToArray());

    /// <summary>
    /// The standard atomic weight in amu of the element with this symbol (exact case, surrounding white
    /// space ignored), or false when there is no such element in the table.
    /// </summary>
    public static bool TryGetStandardAtomicWeightAmu(string? symbol, out double massAmu)
    {
        if (TryFind(symbol, out int index))
        {
            massAmu = Table[index].MassAmu;
            return true;
        }

        massAmu = 0.0;
        return false;
    }

    /// <summary>The standard atomic weight in amu; throws <see cref="ArgumentException"/> naming the nearest symbols when unknown.</summary>
    public static double StandardAtomicWeightAmu(string symbol) => Table[Find(symbol)].MassAmu;

    /// <summary>Atomic number Z of the element with this symbol; throws <see cref="ArgumentException"/> when unknown.</summary>
    public static int AtomicNumber(string symbol) => Find(symbol) + 1;

    /// <summary>
    /// False for elements without a stable isotope (Tc, Pm, Po, At, Rn, Fr, Ra, Ac), whose table value is the
    /// mass number of the longest-lived isotope rather than a standard atomic weight.
    /// </summary>
    public static bool HasStandardAtomicWeight(string symbol) => !Table[Find(symbol)].IsMassNumber;

    private static bool TryFind(string? symbol, out int index)
    {
        index = -1;
        return symbol is not null && IndexBySymbol.TryGetValue(symbol.Trim(), out index);
    }

    private static int Find(string symbol)
    {
        ArgumentNullException.ThrowIfNull(symbol);
        if (TryFind(symbol, out int index))
        {
            return index;
        }

        string trimmed = symbol.Trim();
        IReadOnlyList<string> nearest = NearestSymbols(trimmed);
        string hint = nearest.Count == 0 ? "" : $" Nearest known symbol(s): {string.Join(", ", nearest)}.";
        throw new ArgumentException(
            $"Unknown element symbol '{trimmed}'.{hint} Symbols are case-sensitive (e.g. 'Si', 'Ge') and cover Z = 1 (H) to {Table.Length} ({Table[^1].Symbol}).",
            nameof(symbol));
    }

    /// <summary>A case-insensitive match if there is one, else the symbols at the smallest edit distance (at most 2).</summary>
    private static IReadOnlyList<string> NearestSymbols(string symbol)
    {
        string[] caseInsensitive = Table.Select(entry => entry.Symbol)
            .Where(s => string.Equals(s, symbol, StringComparison.OrdinalIgnoreCase))
            .ToArray();
        if (caseInsensitive.Length > 0 || symbol.Length == 0)
        {
            return caseInsensitive;
        }

        var byDistance = Table.Select(entry => (entry.Symbol, Distance: EditDistance(symbol.ToUpperInvariant(), entry.Symbol.ToUpperInvariant())))
            .Where(candidate => candidate.Distance <= 2)
            .ToArray();
        if (byDistance.Length == 0)
        {
            return [];
        }

        int best = byDistance.Min(candidate => candidate.Distance);
        return byDistance.Where(candidate => candidate.Distance == best).Select(candidate => candidate.Symbol).Take(8).ToArray();
    }

    private static int EditDistance(string a, string b)
    {
        var previous = new int[b.Length + 1];
        var current = new int[b.Length + 1];
        for (int j = 0; j <= b.Length; j++)
        {
            previous[j] = j;
        }

        for (int i = 1; i <= a.Length; i++)
        {
            current[0] = i;
            for (int j = 1; j <= b.Length; j++)
            {
                int substitution = previous[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1);
                current[j] = Math.Min(substitution, Math.Min(previous[j], current[j - 1]) + 1);
            }

            (previous, current) = (current, previous);
        }

        return previous[b.Length];
    }

    private readonly record struct Entry(string Symbol, double MassAmu, bool IsMassNumber = false);
}
