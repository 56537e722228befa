namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The mesh cells around q = 0 whose lowest <see cref="Branches"/> branches (the acoustic ones) are
/// integrated along rays (<see cref="LongWaveRegion"/>) instead of by simplices: the cells with
/// offsets n_i in [-K_i, K_i - 1] from q = 0 along each mesh direction, n_i = i_i - floor(M_i / 2).
/// Unused directions of a 1D or 2D lattice take every cell. The box is inversion-symmetric, so a
/// cell and its image under q -> -q are both in or both out.
/// </summary>
internal readonly record struct LongWaveBox(int K1, int K2, int K3, int Branches)
{
    /// <summary>True when the mesh cell with base indices (i1, i2, i3) lies inside the box.</summary>
    public bool ContainsCell(int i1, int i2, int i3, int m1, int m2, int m3) =>
        Inside(i1, m1, K1) && Inside(i2, m2, K2) && Inside(i3, m3, K3);

    /// <summary>The first branch the simplices integrate in cell (i1, i2, i3): past the acoustic ones inside the box.</summary>
    public int FirstSimplexBranch(int i1, int i2, int i3, int m1, int m2, int m3) =>
        ContainsCell(i1, i2, i3, m1, m2, m3) ? Branches : 0;

    private static bool Inside(int i, int m, int k)
    {
        var n = i - (m / 2);
        return n >= -k && n <= k - 1;
    }
}
