using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Engine.Tests.Support;

/// <summary>Invented demo models with bond-bending terms (round numbers, not materials).</summary>
internal static class BondedCrystals
{
    public const double DiamondConstantNm = 0.55;

    /// <summary>Diamond or zinc-blende with stretch and Keating bend constants (N/m).</summary>
    public static CrystalModel Tetrahedral(double stretch, double bend, double massA = 28, double massB = 28) =>
        TetrahedralModelBuilder.Build(new TetrahedralModelSpec(
            massA == massB ? TetrahedralStructure.Diamond : TetrahedralStructure.ZincBlende, DiamondConstantNm, massA, massB, stretch, bend));

    /// <summary>
    /// A honeycomb sheet (triangular net a = 0.25 nm, sites at 1/3 and 2/3): bond stretch, Keating
    /// in-plane bending at both sites, and (optionally) flexural bending on each site's straight
    /// triples: a nearest neighbour and the other-kind site straight across the ring (shells 1 and 2);
    /// or a transverse constant on the bonds instead.
    /// </summary>
    public static CrystalModel Honeycomb(double stretch = 400, double inPlaneBend = 50, double flexural = 5, double transverse = 0)
    {
        var bends = new List<BendSpring>
        {
            new("A", "B", 1, BendForm.Keating, inPlaneBend),
            new("B", "A", 1, BendForm.Keating, inPlaneBend),
        };
        if (flexural != 0)
        {
            bends.Add(new("A", "B", 1, BendForm.Flexural, flexural) { OtherShell = 2 });
            bends.Add(new("B", "A", 1, BendForm.Flexural, flexural) { OtherShell = 2 });
        }

        return CrystalModel.Create(
            Lattice.Hexagonal(0.25),
            [new Site("A", "A", new Vec3(1.0 / 3, 1.0 / 3, 0), 12), new Site("B", "B", new Vec3(2.0 / 3, 2.0 / 3, 0), 12)],
            [new ShellSpring("A", "B", 1, stretch, transverse)],
            bends: bends);
    }
}
