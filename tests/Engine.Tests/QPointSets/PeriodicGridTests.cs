using LatticeSweep.Engine.QPoints;

namespace LatticeSweep.Engine.Tests.QPointSets; // not .QPoints: that would hide Engine.QPoints from the other tests

/// <summary>
/// The half set against its definition (common practice, no source): every flat index i with
/// index(-q) >= i, visited once in mesh order, with -q's index, weight 2 (1 where q = -q) and the
/// reduced coordinates; weights add up to the cell count. Odd and even counts on every axis, so the
/// skips past rejected rows, slabs and the chain's second half are all taken.
/// </summary>
public sealed class PeriodicGridTests
{
    [Theory]
    [InlineData(1, 1, 1)]
    [InlineData(10, 1, 1)]
    [InlineData(11, 1, 1)]
    [InlineData(4, 5, 1)]
    [InlineData(5, 4, 1)]
    [InlineData(4, 4, 4)]
    [InlineData(3, 5, 7)]
    [InlineData(6, 3, 4)]
    [InlineData(1, 6, 5)]
    public void Half_set_visits_each_pair_of_wave_vectors_once(int n1, int n2, int n3)
    {
        var grid = new PeriodicGrid(n1, n2, n3);
        var expected = new List<(long Self, long Partner, double R1, double R2, double R3)>();
        for (var i1 = 0; i1 < n1; i1++)
        {
            for (var i2 = 0; i2 < n2; i2++)
            {
                for (var i3 = 0; i3 < n3; i3++)
                {
                    var self = grid.Index(i1, i2, i3);
                    var partner = grid.Index(PeriodicGrid.Partner(i1, n1), PeriodicGrid.Partner(i2, n2), PeriodicGrid.Partner(i3, n3));
                    if (partner >= self)
                    {
                        expected.Add((self, partner, PeriodicGrid.Reduced(i1, n1), PeriodicGrid.Reduced(i2, n2), PeriodicGrid.Reduced(i3, n3)));
                    }
                }
            }
        }

        var visited = new List<GridPoint>();
        foreach (var p in grid.HalfSet())
        {
            visited.Add(p);
        }

        Assert.Equal(expected.Count, visited.Count);
        Assert.Equal(grid.HalfCount, visited.Count);
        for (var k = 0; k < expected.Count; k++)
        {
            var (self, partner, r1, r2, r3) = expected[k];
            Assert.Equal(self, visited[k].Index);
            Assert.Equal(partner, visited[k].PartnerIndex);
            Assert.Equal(partner == self ? 1 : 2, visited[k].Weight);
            Assert.Equal((r1, r2, r3), (visited[k].Reduced.X, visited[k].Reduced.Y, visited[k].Reduced.Z));
        }

        Assert.Equal(grid.Count, visited.Sum(p => (long)p.Weight));
        Assert.Equal(1, visited.Count(p => p.IsGamma));
    }

    [Theory]
    [InlineData(1, 1, 1)]
    [InlineData(10, 1, 1)]
    [InlineData(11, 1, 1)]
    [InlineData(4, 5, 1)]
    [InlineData(5, 4, 1)]
    [InlineData(4, 4, 4)]
    [InlineData(3, 5, 7)]
    [InlineData(6, 3, 4)]
    [InlineData(1, 6, 5)]
    [InlineData(1000, 1, 1)]
    [InlineData(1, 1, 9)]
    public void Filling_buffers_gives_the_enumerators_points_in_its_order_whatever_the_buffer_size(int n1, int n2, int n3)
    {
        var grid = new PeriodicGrid(n1, n2, n3);
        var expected = new List<GridPoint>();
        foreach (var p in grid.HalfSet())
        {
            expected.Add(p);
        }

        foreach (var size in new[] { 1, 2, 3, 7, 32, 5000 })
        {
            var filled = new List<GridPoint>();
            var buffer = new GridPoint[size];
            var cursor = default(HalfSetCursor);
            int count;
            while ((count = grid.FillHalfSet(ref cursor, buffer)) > 0)
            {
                filled.AddRange(buffer.AsSpan(0, count));
            }

            Assert.Equal(0, grid.FillHalfSet(ref cursor, buffer)); // stays at the end
            Assert.Equal(expected, filled); // record structs: index, partner, reduced (bit for bit), weight, Gamma
        }
    }
}
