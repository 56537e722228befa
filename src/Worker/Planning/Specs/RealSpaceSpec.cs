using System.Collections.Immutable;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>
/// What a finite sample adds when it is more than a periodic crystal (<c>boundaries</c>, <c>shape</c>,
/// <c>disorder</c>, the solver settings): the job file's numbers, before the Engine sample is built.
/// </summary>
internal sealed record RealSpaceSpec
{
    /// <summary>One per lattice direction.</summary>
    public required ImmutableArray<Boundary> Boundaries { get; init; }

    /// <summary>"box", "sphere" or "cylinder".</summary>
    public string Shape { get; init; } = "box";

    public double? RadiusNm { get; init; }

    /// <summary>0-based lattice direction of a cylinder's axis (the job file counts from 1).</summary>
    public int Axis { get; init; }

    public Vec3 CentreFractional { get; init; }

    public RealSpaceMethod Method { get; init; } = RealSpaceMethod.Auto;

    public int DenseMaxAtoms { get; init; } = RealSpaceSample.DefaultDenseMaxAtoms;

    public double SurfaceWeightThreshold { get; init; } = 0.5;

    public KpmSettings Kpm { get; init; } = new();

    public DisorderSpec? Disorder { get; init; }
}

/// <summary>One substitution as written: the substitute's mass directly or by element.</summary>
internal sealed record SubstitutionSpec(string Site, double? MassAmu, string? Element, double Concentration, double SpringFactor);

internal sealed record DisorderSpec(ImmutableArray<SubstitutionSpec> Substitutions, int Configurations, long Seed);
