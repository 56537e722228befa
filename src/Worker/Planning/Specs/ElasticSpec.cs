using LatticeSweep.Engine.Models;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>A monatomic cubic crystal whose springs are fitted to its elastic constants C11, C12, C44.</summary>
internal sealed record ElasticSpec : ModelSpec
{
    public required LatticeKind Lattice { get; init; }
    public required double ConstantNm { get; init; }
    public double? MassAmu { get; init; }
    public string? Element { get; init; }
    public required double C11Gpa { get; init; }
    public required double C12Gpa { get; init; }
    public required double C44Gpa { get; init; }
    public bool NextNearest { get; init; } = true;

    public override int Dimension => 3;
}
