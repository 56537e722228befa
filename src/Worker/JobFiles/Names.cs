using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>The job-file words for Engine enumerations, in one place.</summary>
internal static class Names
{
    public static readonly IReadOnlyDictionary<string, LatticeKind> Lattices = new Dictionary<string, LatticeKind>(StringComparer.Ordinal)
    {
        ["chain"] = LatticeKind.Chain,
        ["square"] = LatticeKind.Square,
        ["hexagonal"] = LatticeKind.Hexagonal,
        ["simple_cubic"] = LatticeKind.SimpleCubic,
        ["bcc"] = LatticeKind.BodyCentredCubic,
        ["fcc"] = LatticeKind.FaceCentredCubic,
        ["explicit"] = LatticeKind.Explicit,
    };

    public static readonly IReadOnlyDictionary<string, LatticeKind> CubicLattices = new Dictionary<string, LatticeKind>(StringComparer.Ordinal)
    {
        ["simple_cubic"] = LatticeKind.SimpleCubic,
        ["bcc"] = LatticeKind.BodyCentredCubic,
        ["fcc"] = LatticeKind.FaceCentredCubic,
    };

    public static readonly IReadOnlyDictionary<string, DegreesOfFreedom> Motions = new Dictionary<string, DegreesOfFreedom>(StringComparer.Ordinal)
    {
        ["3d"] = DegreesOfFreedom.Cartesian,
        ["scalar"] = DegreesOfFreedom.Scalar,
    };

    public static readonly IReadOnlyDictionary<string, LayeredHost> Hosts = new Dictionary<string, LayeredHost>(StringComparer.Ordinal)
    {
        ["chain"] = LayeredHost.Chain,
        ["cubic_stack"] = LayeredHost.CubicStack,
    };

    /// <summary>Null when the symbol has a mass in the Engine's element table, else what is wrong and the nearest symbol.</summary>
    public static string? CheckElement(string symbol)
    {
        if (Elements.TryGetStandardAtomicWeightAmu(symbol, out _))
        {
            return null;
        }

        var fixedCase = symbol.Length == 0 ? symbol : char.ToUpperInvariant(symbol[0]) + symbol[1..].ToLowerInvariant();
        var hint = Elements.TryGetStandardAtomicWeightAmu(fixedCase, out _) ? fixedCase : KeySuggestions.Nearest(symbol, Elements.Symbols);
        return $"unknown element symbol '{EchoText.Of(symbol)}' (symbols are case-sensitive, H to U)" + (hint is null ? "; or give mass_amu" : $"; did you mean '{hint}'?");
    }
}
