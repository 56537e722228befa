using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Samples;

/// <summary>
/// The distance between a real-space sample's free surfaces: the default length of its boundary
/// scattering. A film's is its thickness across the free direction, N_i times the spacing of the
/// lattice planes the other vectors span (not N_i |a_i|: a (111) film of fcc primitive cells is
/// 22 % thinner than that); a wire's the smallest such thickness across it; a cylinder's or a
/// sphere's its diameter (Casimir, Physica 5, 495 (1938): a round wire's length is its diameter).
/// Periodic directions have no walls and never set it.
/// </summary>
public static class WallDistance
{
    /// <summary>The smallest distance between free surfaces, nm; null when the sample has none.</summary>
    public static double? SmallestNm(Lattice lattice, RealSpaceSample sample)
    {
        ArgumentNullException.ThrowIfNull(lattice);
        ArgumentNullException.ThrowIfNull(sample);
        double? smallest = sample.Shape switch
        {
            SphereShape sphere => 2 * sphere.RadiusNm,
            CylinderShape cylinder => 2 * cylinder.RadiusNm,
            _ => null,
        };

        // A cylinder's axis may be free too (a short rod): its length then competes with the diameter.
        for (var i = 0; i < lattice.Dimension; i++)
        {
            var acrossShape = sample.Shape is SphereShape || (sample.Shape is CylinderShape c && c.Axis != i);
            if (sample.BoundaryOf(i) == Boundary.Free && !acrossShape)
            {
                var thickness = sample.Cells(i) * PlaneSpacingNm(lattice, i);
                smallest = smallest is { } s ? Math.Min(s, thickness) : thickness;
            }
        }

        return smallest;
    }

    /// <summary>Spacing of the lattice planes spanned by the other primitive vectors (along the chain in 1D), nm.</summary>
    public static double PlaneSpacingNm(Lattice lattice, int axis)
    {
        ArgumentNullException.ThrowIfNull(lattice);
        var d = lattice.Dimension;
        var others = Enumerable.Range(0, d).Where(j => j != axis).Select(lattice.Vector).ToArray();
        var spanned = d switch
        {
            1 => 1.0,
            2 => others[0].Length,
            _ => others[0].Cross(others[1]).Length,
        };
        return lattice.CellMeasure / spanned * 1e9;
    }
}
