namespace LatticeSweep.Engine.Builders;

/// <summary>The two tetrahedrally bonded cubic structures: both are fcc with a two-site basis at (0,0,0) and a(1/4,1/4,1/4).</summary>
public enum TetrahedralStructure
{
    /// <summary>Both sites the same element (the B site takes A's mass).</summary>
    Diamond,

    /// <summary>Two elements, each bonded only to the other.</summary>
    ZincBlende,
}
