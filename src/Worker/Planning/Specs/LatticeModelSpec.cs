using System.Collections.Immutable;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>A Bravais lattice with a basis of sites, joined by springs by shell and by explicit bonds, and bent by three-body terms.</summary>
internal sealed record LatticeModelSpec : ModelSpec
{
    public required LatticeKind Lattice { get; init; }

    /// <summary>Lattice constant a (nm); unused for explicit vectors.</summary>
    public double ConstantNm { get; init; }

    /// <summary>c (nm) of the 3D hexagonal lattice; null for the 2D triangular net.</summary>
    public double? CNm { get; init; }

    public ImmutableArray<Vec3> VectorsNm { get; init; } = [];

    public double ShellToleranceNm { get; init; } = CrystalModel.DefaultShellToleranceNm;

    public required ImmutableArray<SiteSpec> Sites { get; init; }

    public ImmutableArray<ShellSpring> Springs { get; init; } = [];

    public ImmutableArray<BondSpring> Bonds { get; init; } = [];

    /// <summary>Three-body bond-bending terms (<c>[[model.bends]]</c>).</summary>
    public ImmutableArray<BendSpring> Bends { get; init; } = [];

    /// <summary>Pair potentials between site kinds (<c>[[model.potentials]]</c>); their springs follow from the geometry.</summary>
    public ImmutableArray<PotentialTerm> Potentials { get; init; } = [];

    /// <summary>Scale the lattice to the minimum of the potentials' static energy before solving.</summary>
    public bool Relax { get; init; }

    public override int Dimension => Lattice switch
    {
        LatticeKind.Chain => 1,
        LatticeKind.Square => 2,
        LatticeKind.Hexagonal => CNm is null ? 2 : 3,
        LatticeKind.Explicit => VectorsNm.Length,
        _ => 3,
    };
}
