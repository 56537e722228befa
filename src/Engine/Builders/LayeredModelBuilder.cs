using System.Globalization;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Engine.Builders;

/// <summary>Builds a <see cref="CrystalModel"/> from a <see cref="LayeredModelSpec"/>.</summary>
public static class LayeredModelBuilder
{
    public const int MaxSitesPerCell = 4096;

    public static CrystalModel Build(LayeredModelSpec spec)
    {
        ArgumentNullException.ThrowIfNull(spec);
        Guard.PositiveFinite(spec.SpacingNm, "model.layers.spacing_nm", "the site spacing");
        Guard.InRange(spec.SitesPerCell, 1, MaxSitesPerCell, "model.layers.sites_per_cell", "sites per cell");
        var r = spec.SitesPerCell;
        var s = spec.SpacingNm;

        var lattice = spec.Host switch
        {
            LayeredHost.Chain => Lattice.Explicit([new Vec3(r * s, 0, 0)]),
            _ => Lattice.Explicit([new Vec3(s, 0, 0), new Vec3(0, s, 0), new Vec3(0, 0, r * s)]),
        };
        var axis = spec.Host == LayeredHost.Chain ? 0 : 2;

        var sites = new List<Site>(r);
        for (var k = 0; k < r; k++)
        {
            var mass = spec.Masses.MassOf(k, r);
            var f = (double)k / r;
            var position = axis == 0 ? new Vec3(f, 0, 0) : new Vec3(0, 0, f);
            var label = "L" + k.ToString(CultureInfo.InvariantCulture);
            sites.Add(new Site(label, KindOf(spec.Masses, k, r), position, mass));
        }

        var bonds = new List<BondSpring>(3 * r);
        for (var k = 0; k < r; k++)
        {
            // Along the stacking axis each site bonds to the next; the last to the first of the next cell.
            var next = (k + 1) % r;
            var offset = k + 1 < r ? IntVec3.Zero : (axis == 0 ? new IntVec3(1, 0, 0) : new IntVec3(0, 0, 1));
            bonds.Add(new BondSpring(sites[k].Label, sites[next].Label, offset, spec.LongitudinalNPerM, spec.TransverseNPerM));
            if (spec.Host == LayeredHost.CubicStack)
            {
                bonds.Add(new BondSpring(sites[k].Label, sites[k].Label, new IntVec3(1, 0, 0), spec.LongitudinalNPerM, spec.TransverseNPerM));
                bonds.Add(new BondSpring(sites[k].Label, sites[k].Label, new IntVec3(0, 1, 0), spec.LongitudinalNPerM, spec.TransverseNPerM));
            }
        }

        return CrystalModel.Create(lattice, sites, bondSprings: bonds, degreesOfFreedom: spec.DegreesOfFreedom);
    }

    private static string KindOf(MassPattern pattern, int k, int r) =>
        pattern.FirstCount is { } r1
            ? (k < r1 ? "A" : "B")
            : "M" + (k % pattern.SequenceAmu.Length).ToString(CultureInfo.InvariantCulture);
}
