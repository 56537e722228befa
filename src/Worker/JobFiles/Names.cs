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

    /// <summary>Standard atomic weight of an element symbol, or a message saying what is wrong.</summary>
    public static string? CheckElement(string symbol)
    {
        if (Elements.TryGetStandardAtomicWeightAmu(symbol, out _))
        {
            return null;
        }

        var fixedCase = symbol.Length == 0 ? symbol : char.ToUpperInvariant(symbol[0]) + symbol[1..].ToLowerInvariant();
        if (fixedCase != symbol && Elements.TryGetStandardAtomicWeightAmu(fixedCase, out _))
        {
            return $"unknown element symbol '{symbol}'; did you mean '{fixedCase}'?";
        }

        return $"unknown element symbol '{symbol}' (or one without a standard atomic weight); give mass_amu instead";
    }
}
