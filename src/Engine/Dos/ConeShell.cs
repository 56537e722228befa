namespace LatticeSweep.Engine.Dos;

/// <summary>
/// The mesh cubes just outside the long-wave box (<see cref="LongWaveBox"/>), within <see cref="Cells"/>
/// cells of it along every mesh direction (periodic): the only cubes whose tetrahedra the simplices
/// split on the branch's quadratic model (<see cref="QuadraticTetrahedron"/>).
/// <para>
/// Why only there: the split is for the cone next to q = 0, where a tetrahedron's uniform curvature
/// shift is a sizeable part of its spread (a quarter of the frequency one cell outside a box one cell
/// wide) and carried states below anything the branch has there (docs/outside-checks.md, Round 15 and
/// Round 16 (low-temperature heat capacity)). A cone's shift falls as its spread over the distance to
/// q = 0 (about 0.04 / r of the spread r cells out), so past two cells from a box one cell wide it stays
/// below the split threshold anyway; deciding per cube from its mesh indices costs nothing, while
/// testing every tetrahedron of the mesh doubled the bulk DOS of a two-site fcc cell on 48^3
/// (bench/README.md, Round 16). Every cube outside the shell, and every cube inside the box, keeps the
/// uniform shift and the vector kernel, to the bit.
/// </para>
/// </summary>
internal sealed class ConeShell
{
    /// <summary>How far outside the box (mesh cells, along each direction) cubes may be split.</summary>
    public const int Cells = 2;

    private readonly bool[][] _near;
    private readonly LongWaveBox _box;

    private ConeShell(LongWaveBox box, bool[][] near)
    {
        _box = box;
        _near = near;
    }

    /// <summary>The shell around the box on this mesh.</summary>
    public static ConeShell Around(LongWaveBox box, int m1, int m2, int m3) =>
        new(box, [Near(m1, box.K1), Near(m2, box.K2), Near(m3, box.K3)]);

    /// <summary>
    /// True when the cube based at (i1, i2, i3) is within <see cref="Cells"/> of the box along every
    /// direction and some acoustic branch goes through its tetrahedra (it is not inside the box).
    /// Inversion-symmetric like the box, and symmetric under permutations of axes of equal count and
    /// box width, so a cube and its orbit are all in or all out.
    /// </summary>
    public bool Contains(int i1, int i2, int i3, int firstBranch) =>
        firstBranch < _box.Branches && _near[0][i1] && _near[1][i2] && _near[2][i3];

    /// <summary>Per base index along one direction: the cube's offset n = i - floor(M / 2) lies in [-K - Cells, K - 1 + Cells].</summary>
    private static bool[] Near(int m, int k)
    {
        var near = new bool[m];
        for (var i = 0; i < m; i++)
        {
            var n = i - (m / 2);
            near[i] = n >= -k - Cells && n <= k - 1 + Cells;
        }

        return near;
    }
}
