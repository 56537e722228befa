namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The mesh cells around a zero valley away from q = 0 (<see cref="ZeroValleys"/>) whose lowest <see cref="Branches"/>
/// branches the rays integrate instead of the simplices. Positions are in half mesh steps from q = 0 along each mesh
/// direction (doubled offsets, 2 n with n = i - floor(M / 2)), so a centre may be a mesh point (even) or the centre of
/// a cell (odd, a zone-boundary point of an odd mesh); the box reaches <see cref="Half2"/> half steps either way and
/// its faces lie on mesh planes (centre minus half even). Unused directions take every cell: a sheet's third, and a chain's
/// second and third (its box has one entry per direction, <c>Centre2.Length</c> 1).
/// </summary>
internal sealed record ZeroValleyBox(int[] Centre2, int[] Half2, int Branches)
{
    /// <summary>True when the mesh cell with base indices (i1, i2) lies inside the box (a sheet: the third index is ignored).</summary>
    public bool Holds(int i1, int i2, int m1, int m2) => Inside(i1, m1, 0) && (Centre2.Length < 2 || Inside(i2, m2, 1));

    private bool Inside(int i, int m, int axis)
    {
        // The cell spans doubled offsets [2n, 2n + 2]; measured from the box's lower face on the ring of 2m.
        var lower = Centre2[axis] - Half2[axis];
        var from = ((((2 * (i - (m / 2))) - lower) % (2 * m)) + (2 * m)) % (2 * m);
        return from + 2 <= 2 * Half2[axis];
    }

    /// <summary>True when this box and one centred at <paramref name="centre2"/> reaching <paramref name="half2"/> share a cell (sheets: two directions; chains: one).</summary>
    public bool Overlaps(int[] centre2, int[] half2, int m1, int m2) =>
        Apart(Centre2[0], centre2[0], m1) < Half2[0] + half2[0] && (Centre2.Length < 2 || Apart(Centre2[1], centre2[1], m2) < Half2[1] + half2[1]);

    /// <summary>The distance of two doubled offsets on the ring of 2m.</summary>
    internal static int Apart(int a, int b, int m)
    {
        var d = (((a - b) % (2 * m)) + (2 * m)) % (2 * m);
        return Math.Min(d, (2 * m) - d);
    }
}
