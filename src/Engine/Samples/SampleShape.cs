using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Samples;

/// <summary>
/// Which sites of the lattice a <see cref="RealSpaceSample"/> keeps: the whole block of cells, or the
/// sites within a radius of a centre (a sphere) or of an axis (a cylinder). The centre sits on basis
/// site 0 of the cell at the origin, moved by <see cref="CentreFractional"/> (units of the lattice vectors).
/// </summary>
public abstract record SampleShape
{
    /// <summary>Offset of the centre from site 0 of the origin cell, in units of the lattice vectors.</summary>
    public Vec3 CentreFractional { get; init; }

    /// <summary>Name used in results: "box", "sphere" or "cylinder".</summary>
    public abstract string Name { get; }
}

/// <summary>Every site of the N1 x N2 x N3 cells.</summary>
public sealed record BoxShape : SampleShape
{
    public static BoxShape Instance { get; } = new();

    public override string Name => "box";
}

/// <summary>Sites within <see cref="RadiusNm"/> of the centre (a disc on a 2D lattice, a segment on a chain); every direction free.</summary>
public sealed record SphereShape(double RadiusNm) : SampleShape
{
    public override string Name => "sphere";
}

/// <summary>
/// Sites within <see cref="RadiusNm"/> of the line through the centre along lattice vector
/// <see cref="Axis"/> (0-based): a wire when that direction is periodic, a rod when it is free. The
/// directions across the axis are free; along it the sample has the given cells. On a 2D lattice
/// this is a ribbon of width 2R.
/// </summary>
public sealed record CylinderShape(double RadiusNm, int Axis) : SampleShape
{
    public override string Name => "cylinder";
}
