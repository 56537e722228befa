using LatticeSweep.Engine.Dos;

namespace LatticeSweep.Engine.Tests.Dos;

/// <summary>
/// The cells a zero valley's box takes from the simplices (<see cref="ZeroValleyBox"/>): positions in half mesh steps from
/// q = 0, the mesh index i at offset n = i - floor(M / 2), wrapped on the ring of the zone (hand-counted).
/// </summary>
public sealed class ZeroValleyBoxTests
{
    [Fact]
    public void An_odd_meshs_zone_corner_box_is_centred_on_a_cell_and_wraps_across_the_zone_boundary()
    {
        // Mesh 21: the zone corner 1/2 is offset 10.5 (doubled 21), the centre of the cell from i = 20 to i = 21 = 0.
        // Half-width 7 half steps: offsets 7..13 (cells [2n, 2n + 2] inside [14, 28]), i = 17..23, wrapped 17..20 and 0..2.
        Assert.Equal(21, ZeroValleys.Centre2(0.5, 21));
        var box = new ZeroValleyBox([21, 21], [7, 7], 1);
        int[] inside = [17, 18, 19, 20, 0, 1, 2];
        for (var i = 0; i < 21; i++)
        {
            Assert.Equal(inside.Contains(i), box.Holds(i, 20, 21, 21));
            Assert.False(box.Holds(i, 10, 21, 21)); // offset 0 across: q = 0's row, not the corner's
        }
    }

    [Fact]
    public void An_even_meshs_zone_corner_box_is_centred_on_the_mesh_point_at_index_zero()
    {
        // Mesh 20: 1/2 is offset 10 (doubled 20), the mesh point i = 0; half-width 4 half steps holds offsets 8..11, i = 18, 19, 0, 1.
        Assert.Equal(20, ZeroValleys.Centre2(0.5, 20));
        var box = new ZeroValleyBox([20, 20], [4, 4], 1);
        int[] inside = [18, 19, 0, 1];
        for (var i = 0; i < 20; i++)
        {
            Assert.Equal(inside.Contains(i), box.Holds(i, 0, 20, 20));
        }
    }

    [Fact]
    public void Boxes_overlap_only_when_they_share_a_cell_in_every_direction()
    {
        // q = 0's box of 4 cells either way (8 half steps) and the corner's on mesh 20: 20 half steps apart on the ring of 40.
        var gamma = new ZeroValleyBox([0, 0], [8, 8], 0);
        Assert.False(gamma.Overlaps([20, 20], [4, 4], 20, 20));
        Assert.False(gamma.Overlaps([20, 20], [12, 12], 20, 20)); // touching faces: 8 + 12 = 20 half steps, no shared cell
        Assert.True(gamma.Overlaps([20, 20], [14, 14], 20, 20));
        Assert.False(gamma.Overlaps([20, 0], [12, 8], 20, 20)); // X = (1/2, 0): apart along x only, which is enough
        Assert.True(gamma.Overlaps([20, 0], [14, 8], 20, 20));
        Assert.Equal(8, ZeroValleyBox.Apart(36, 4, 20)); // across the zone boundary
    }

    [Fact]
    public void A_third_of_the_zone_is_a_box_centre_only_on_meshes_divisible_by_3()
    {
        Assert.Equal(14, ZeroValleys.Centre2(1.0 / 3, 21));
        Assert.Equal(12, ZeroValleys.Centre2(1.0 / 3, 18));
        Assert.Null(ZeroValleys.Centre2(1.0 / 3, 20));
        Assert.Null(ZeroValleys.Centre2(2.0 / 3, 16));
    }
}
