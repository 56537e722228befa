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

    /// <summary>Mesh index of -q's coordinate along an axis.</summary>
    public static int Partner(int i, int n)
    {
        var h = n / 2;
        var m = -(i - h);
        var wrapped = ((m + h) % n + n) % n;
        return wrapped;
    }

    /// <summary>Every wave vector once up to time reversal: (mesh indices, reduced q, weight 1 or 2, flat index of -q).</summary>
    public IEnumerable<GridPoint> HalfSet()
    {
        for (var i1 = 0; i1 < N1; i1++)
        {
            var p1 = Partner(i1, N1);
            for (var i2 = 0; i2 < N2; i2++)
            {
                var p2 = Partner(i2, N2);
                for (var i3 = 0; i3 < N3; i3++)
                {
                    var p3 = Partner(i3, N3);
                    var self = Index(i1, i2, i3);
                    var partner = Index(p1, p2, p3);
                    if (partner < self)
                    {
                        continue;
                    }

                    var reduced = new Vec3(Reduced(i1, N1), Reduced(i2, N2), Reduced(i3, N3));
                    var isGamma = i1 == N1 / 2 && i2 == N2 / 2 && i3 == N3 / 2;
                    yield return new GridPoint(self, partner, reduced, partner == self ? 1 : 2, isGamma);
                }
            }
        }
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

/// <summary>One visited wave vector of a <see cref="PeriodicGrid"/>.</summary>
internal readonly record struct GridPoint(long Index, long PartnerIndex, Vec3 Reduced, int Weight, bool IsGamma);
