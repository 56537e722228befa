using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.QPoints;

/// <summary>
/// The wave vectors q = sum_i n_i b_i / N_i, n_i integer in [-N_i/2, N_i/2): exactly the allowed
/// set of a Born-von Karman crystal of N1 x N2 x N3 cells (Ashcroft and Mermin, ch. 8, eq. 8.27),
/// and the Gamma-centred mesh of the bulk limit. Time reversal gives omega(-q) = omega(q), so only
/// one of each pair {q, -q} is visited, with weight 2 (weight 1 where q and -q coincide).
/// </summary>
internal readonly record struct PeriodicGrid(int N1, int N2, int N3)
{
    public long Count => (long)N1 * N2 * N3;

    /// <summary>Flat index of integer coordinates given as mesh indices i_k in [0, N_k).</summary>
    public long Index(int i1, int i2, int i3) => ((long)i1 * N2 + i2) * N3 + i3;

    /// <summary>Reduced coordinate n_k / N_k of mesh index i_k, with n_k = i_k - floor(N_k / 2) in [-N/2, N/2).</summary>
    public static double Reduced(int i, int n) => (double)(i - n / 2) / n;

    /// <summary>Mesh index of -q's coordinate along an axis: n -> -n, i.e. i -> 2 floor(N/2) - i, wrapped into [0, N).</summary>
    public static int Partner(int i, int n)
    {
        if (n % 2 == 1)
        {
            return n - 1 - i;
        }

        return i == 0 ? 0 : n - i;
    }

    /// <summary>
    /// Every wave vector once up to time reversal: (mesh indices, reduced q, weight 1 or 2, flat index of -q).
    /// A struct enumerable, so a foreach over millions of points costs no allocation or interface call.
    /// </summary>
    public HalfSetEnumerable HalfSet() => new(this);

    /// <summary>The points of <see cref="HalfSet"/>, in mesh order.</summary>
    internal readonly struct HalfSetEnumerable(PeriodicGrid grid) : IEnumerable<GridPoint>
    {
        public HalfSetEnumerator GetEnumerator() => new(grid);

        IEnumerator<GridPoint> IEnumerable<GridPoint>.GetEnumerator() => GetEnumerator();

        System.Collections.IEnumerator System.Collections.IEnumerable.GetEnumerator() => GetEnumerator();
    }

    internal struct HalfSetEnumerator(PeriodicGrid grid) : IEnumerator<GridPoint>
    {
        private int _i1;
        private int _i2;
        private int _i3 = -1;
        private long _self = -1;
        private GridPoint _current;

        public readonly GridPoint Current => _current;

        readonly object System.Collections.IEnumerator.Current => _current;

        public bool MoveNext()
        {
            var (n1, n2, n3) = (grid.N1, grid.N2, grid.N3);
            while (true)
            {
                if (++_i3 == n3)
                {
                    _i3 = 0;
                    if (++_i2 == n2)
                    {
                        _i2 = 0;
                        if (++_i1 == n1)
                        {
                            _i1 = n1; // stays past the end
                            _i3 = n3 - 1;
                            _i2 = n2 - 1;
                            return false;
                        }
                    }
                }

                _self++;
                var (p1, p2) = (Partner(_i1, n1), Partner(_i2, n2));
                var partner = grid.Index(p1, p2, Partner(_i3, n3));
                if (partner < _self)
                {
                    // Partner(i) - i only decreases with i, so the first axis where -q's index falls
                    // below q's stays below for the rest of that axis' range: jump past it (the
                    // second half of a chain, slabs and rows of a mesh) instead of visiting each point.
                    if (p1 < _i1)
                    {
                        _i1 = n1;
                        _i3 = n3 - 1;
                        _i2 = n2 - 1;
                        return false;
                    }

                    if (p1 == _i1 && p2 < _i2)
                    {
                        _self += ((long)(n2 - 1 - _i2) * n3) + (n3 - 1 - _i3);
                        _i2 = n2 - 1;
                    }
                    else
                    {
                        _self += n3 - 1 - _i3;
                    }

                    _i3 = n3 - 1;
                    continue;
                }

                var reduced = new Vec3(Reduced(_i1, n1), Reduced(_i2, n2), Reduced(_i3, n3));
                var isGamma = _i1 == n1 / 2 && _i2 == n2 / 2 && _i3 == n3 / 2;
                _current = new GridPoint(_self, partner, reduced, partner == _self ? 1 : 2, isGamma);
                return true;
            }
        }

        public void Reset() => this = new HalfSetEnumerator(grid);

        public readonly void Dispose()
        {
        }
    }

    /// <summary>
    /// The next points of <see cref="HalfSet"/> after <paramref name="cursor"/>, as many as fit
    /// <paramref name="points"/>; returns how many (0 at the end). The same points in the same order
    /// as the enumerator, worked out a mesh row (i1, i2) at a time: a row is kept whole when -q's row
    /// comes after it, skipped when before, and kept up to its middle when it is its own partner row,
    /// so a long row (a chain's) costs one division per point and no partner test.
    /// </summary>
    public int FillHalfSet(ref HalfSetCursor cursor, Span<GridPoint> points)
    {
        var (n1, n2, n3) = (N1, N2, N3);
        var count = 0;
        while (count < points.Length && cursor.I1 < n1)
        {
            var (i1, i2) = (cursor.I1, cursor.I2);
            var (p1, p2) = (Partner(i1, n1), Partner(i2, n2));
            var rowEnd = 0; // i3 past the row's last kept point
            var ownPartner = p1 == i1 && p2 == i2;
            if (p1 > i1 || (p1 == i1 && p2 > i2))
            {
                rowEnd = n3;
            }
            else if (ownPartner)
            {
                rowEnd = n3 % 2 == 0 ? (n3 / 2) + 1 : ((n3 - 1) / 2) + 1;
            }
            else if (p1 < i1)
            {
                cursor.I1 = n1; // every later row comes after its partner's
                break;
            }
            else
            {
                // p1 == i1 and p2 < i2: the rest of this slab comes after its partners.
                NextSlab(ref cursor, n1);
                continue;
            }

            var rowBase = Index(i1, i2, 0);
            var partnerBase = Index(p1, p2, 0);
            var r1 = Reduced(i1, n1);
            var r2 = Reduced(i2, n2);
            var gammaRow = i1 == n1 / 2 && i2 == n2 / 2;
            var i3 = cursor.I3;
            for (; i3 < rowEnd && count < points.Length; i3++)
            {
                var partner = partnerBase + Partner(i3, n3);
                var self = rowBase + i3;
                points[count++] = new GridPoint(self, partner, new Vec3(r1, r2, Reduced(i3, n3)), partner == self ? 1 : 2, gammaRow && i3 == n3 / 2);
            }

            if (i3 < rowEnd)
            {
                cursor.I3 = i3;
                break;
            }

            // The row is done: the next row of the slab, or the next slab.
            cursor.I3 = 0;
            if (++cursor.I2 == n2)
            {
                NextSlab(ref cursor, n1);
            }
        }

        return count;
    }

    private static void NextSlab(ref HalfSetCursor cursor, int n1)
    {
        cursor.I3 = 0;
        cursor.I2 = 0;
        cursor.I1++;
    }

    /// <summary>Number of points <see cref="HalfSet"/> visits.</summary>
    public long HalfCount
    {
        get
        {
            long selfConjugate = SelfConjugate(N1) * SelfConjugate(N2) * SelfConjugate(N3);
            return (Count + selfConjugate) / 2;
        }
    }

    private static long SelfConjugate(int n) => n % 2 == 0 ? 2 : 1;
}

/// <summary>Where <see cref="PeriodicGrid.FillHalfSet"/> goes on: the mesh indices of the next point to consider (start at default).</summary>
internal struct HalfSetCursor
{
    public int I1;
    public int I2;
    public int I3;
}

/// <summary>One visited wave vector of a <see cref="PeriodicGrid"/>.</summary>
internal readonly record struct GridPoint(long Index, long PartnerIndex, Vec3 Reduced, int Weight, bool IsGamma);
