namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The mesh cells around q = 0 whose lowest <see cref="Branches"/> branches (the acoustic ones) are
/// integrated along rays (<see cref="LongWaveRegion"/>) instead of by simplices: the cells with
/// offsets n_i in [-K_i, K_i - 1] from q = 0 along each mesh direction, n_i = i_i - floor(M_i / 2).
/// Unused directions of a 1D or 2D lattice take every cell. The box is inversion-symmetric, so a
/// cell and its image under q -> -q are both in or both out.
/// <para>
/// On a sheet the acoustic branches may have boxes of their own (<see cref="BranchHalfWidths"/>): they
/// nest, branch 0's the widest, so a cell leaves to the rays the branches whose box holds it, the lowest
/// ones first. (K1, K2, K3) is then branch 0's box.
/// </para>
/// </summary>
internal readonly record struct LongWaveBox(int K1, int K2, int K3, int Branches)
{
    /// <summary>True when the mesh cell with base indices (i1, i2, i3) lies inside the box.</summary>
    public bool ContainsCell(int i1, int i2, int i3, int m1, int m2, int m3) =>
        Inside(i1, m1, K1) && Inside(i2, m2, K2) && Inside(i3, m3, K3);

    /// <summary>Per acoustic branch its half-widths [K1, K2, K3] when they differ between branches; null when all share (K1, K2, K3).</summary>
    public IReadOnlyList<int[]>? BranchHalfWidths { get; init; }

    /// <summary>
    /// The slow axis of a layered crystal whose column of cells (<see cref="SlowAxisColumn"/>) the simplices leave
    /// whole to a direct quadrature, or -1 (every ordinary crystal).
    /// </summary>
    public int ColumnAxis { get; init; } = -1;

    /// <summary>The column's half-width across the slow axis, in cells (<see cref="SlowAxisColumn.HalfWidth"/>).</summary>
    public int ColumnHalfWidth { get; init; }

    /// <summary>True when the simplices skip cell (i1, i2, i3) for every branch (<see cref="ColumnAxis"/>).</summary>
    public bool SkipsCell(int i1, int i2, int i3, int m1, int m2, int m3) =>
        ColumnAxis >= 0 && SlowAxisColumn.Holds(ColumnAxis, ColumnHalfWidth, i1, i2, i3, m1, m2, m3);

    /// <summary>
    /// A sheet's zero valleys away from q = 0 (<see cref="ZeroValleys"/>), each with its own box of cells whose lowest branches
    /// the rays integrate; null when there are none (every ordinary crystal). They share no cell with this box nor each other.
    /// </summary>
    public IReadOnlyList<ZeroValleyBox>? Valleys { get; init; }

    /// <summary>The first branch the simplices integrate in cell (i1, i2, i3): past the acoustic ones whose box holds it.</summary>
    public int FirstSimplexBranch(int i1, int i2, int i3, int m1, int m2, int m3)
    {
        if (Valleys is { } valleys)
        {
            foreach (var valley in valleys)
            {
                if (valley.Holds(i1, i2, m1, m2))
                {
                    return valley.Branches;
                }
            }
        }

        if (BranchHalfWidths is not { } widths)
        {
            return ContainsCell(i1, i2, i3, m1, m2, m3) ? Branches : 0;
        }

        // Nested boxes: the first branch whose box misses the cell, and every one above it, go to the simplices.
        for (var k = 0; k < Branches; k++)
        {
            var w = widths[k];
            if (!(Inside(i1, m1, w[0]) && Inside(i2, m2, w[1]) && Inside(i3, m3, w[2])))
            {
                return k;
            }
        }

        return Branches;
    }

    private static bool Inside(int i, int m, int k)
    {
        var n = i - (m / 2);
        return n >= -k && n <= k - 1;
    }
}
