using LatticeSweep.Engine.Builders;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>
/// A diamond or zinc-blende crystal with bond-stretch and Keating bond-bend constants, given or fitted
/// to C11, C12, C44 (<see cref="Fitted"/>). Site A at the origin, B at a(1/4, 1/4, 1/4).
/// </summary>
internal sealed record TetrahedralSpec : ModelSpec
{
    public required TetrahedralStructure Structure { get; init; }
    public required double ConstantNm { get; init; }
    public double? MassAAmu { get; init; }
    public string? ElementA { get; init; }
    public double? MassBAmu { get; init; }
    public string? ElementB { get; init; }
    public double? StretchNPerM { get; init; }
    public double? BendNPerM { get; init; }
    public double? C11Gpa { get; init; }
    public double? C12Gpa { get; init; }
    public double? C44Gpa { get; init; }

    /// <summary>True when the constants are fitted to C11, C12, C44 rather than given.</summary>
    public bool Fitted => C11Gpa is not null;

    public override int Dimension => 3;
}
