namespace LatticeSweep.Audit;

/// <summary>A site: label, fractional position (one entry per lattice direction, rest 0), mass in amu.</summary>
internal sealed record AuditSite(string Label, double[] Fraction, double MassAmu);

/// <summary>A pair spring between site I in cell 0 and site J in cell Cell, constants in N/m.</summary>
internal sealed record AuditBond(int I, int J, int[] Cell, double LongitudinalNPerM, double TransverseNPerM);

/// <summary>
/// One random model as the audit writes it into a job file. The primitive vectors are typed in from
/// the README's lattice table (the same table a user reads), not taken from the engine.
/// </summary>
internal sealed record AuditModel(
    string Lattice, int Dimension, double ConstantNm, double? CNm, string Motion,
    AuditSite[] Sites, AuditBond[] Bonds, ShellSpring[] Shells, AuditBend[]? Bends = null, AuditPotential[]? Potentials = null)
{
    /// <summary>Three-body bends of the model (none for the pair-spring cases).</summary>
    public AuditBend[] BendList => Bends ?? [];

    /// <summary>Pair potentials of the model (none for the pair-spring cases).</summary>
    public AuditPotential[] PotentialList => Potentials ?? [];

    /// <summary>Displacement components per atom.</summary>
    public int Components => Motion switch { "3d" => 3, "in_plane" => 2, _ => 1 };

    public int Size => Components * Sites.Length;

    /// <summary>Primitive vectors in nm (rows), always three; unused directions are the unit axes (never used in a phase).</summary>
    public double[][] Vectors()
    {
        var a = ConstantNm;
        var s3 = Math.Sqrt(3) / 2;
        double[][] v = Lattice switch
        {
            "chain" => [[a, 0, 0], [0, 1, 0], [0, 0, 1]],
            "square" => [[a, 0, 0], [0, a, 0], [0, 0, 1]],
            "hexagonal" => [[a, 0, 0], [0.5 * a, s3 * a, 0], [0, 0, CNm ?? 1]],
            "simple_cubic" => [[a, 0, 0], [0, a, 0], [0, 0, a]],
            "bcc" => [[-0.5 * a, 0.5 * a, 0.5 * a], [0.5 * a, -0.5 * a, 0.5 * a], [0.5 * a, 0.5 * a, -0.5 * a]],
            "fcc" => [[0, 0.5 * a, 0.5 * a], [0.5 * a, 0, 0.5 * a], [0.5 * a, 0.5 * a, 0]],
            _ => throw new ArgumentException($"lattice '{Lattice}' is not one the audit generates"),
        };
        return v;
    }

    /// <summary>Reciprocal vectors b_i (1/nm, with the 2 pi) of the lattice's own directions: b_i . a_j = 2 pi delta_ij.</summary>
    public double[][] Reciprocal()
    {
        var v = Vectors();
        var d = Dimension;
        // Inverse of the d x d block (the unused axes are orthogonal unit vectors, so the 3x3 inverse does it).
        var m = new double[3, 3];
        for (var i = 0; i < 3; i++)
        {
            for (var j = 0; j < 3; j++)
            {
                m[i, j] = v[i][j];
            }
        }

        var inv = Invert3(m);
        var b = new double[3][];
        for (var i = 0; i < 3; i++)
        {
            // b_i = 2 pi * column i of inv(A) where A has a_i as rows.
            b[i] = [2 * Math.PI * inv[0, i], 2 * Math.PI * inv[1, i], 2 * Math.PI * inv[2, i]];
        }

        _ = d;
        return b;
    }

    public double[] Cartesian(double[] fraction)
    {
        var v = Vectors();
        var r = new double[3];
        for (var k = 0; k < fraction.Length; k++)
        {
            for (var x = 0; x < 3; x++)
            {
                r[x] += fraction[k] * v[k][x];
            }
        }

        return r;
    }

    public double[] CartesianQ(double[] reduced)
    {
        var b = Reciprocal();
        var q = new double[3];
        for (var k = 0; k < Dimension; k++)
        {
            for (var x = 0; x < 3; x++)
            {
                q[x] += reduced[k] * b[k][x];
            }
        }

        return q;
    }

    /// <summary>Cell volume (3D, nm^3), area (2D, nm^2) or length (1D, nm).</summary>
    public double CellMeasureNm()
    {
        var v = Vectors();
        return Dimension switch
        {
            1 => Math.Abs(v[0][0]),
            2 => Math.Abs(v[0][0] * v[1][1] - v[0][1] * v[1][0]),
            _ => Math.Abs(Det3(v)),
        };
    }

    private static double Det3(double[][] v) =>
        v[0][0] * (v[1][1] * v[2][2] - v[1][2] * v[2][1])
        - v[0][1] * (v[1][0] * v[2][2] - v[1][2] * v[2][0])
        + v[0][2] * (v[1][0] * v[2][1] - v[1][1] * v[2][0]);

    private static double[,] Invert3(double[,] m)
    {
        var det = m[0, 0] * (m[1, 1] * m[2, 2] - m[1, 2] * m[2, 1])
            - m[0, 1] * (m[1, 0] * m[2, 2] - m[1, 2] * m[2, 0])
            + m[0, 2] * (m[1, 0] * m[2, 1] - m[1, 1] * m[2, 0]);
        var r = new double[3, 3];
        r[0, 0] = (m[1, 1] * m[2, 2] - m[1, 2] * m[2, 1]) / det;
        r[0, 1] = (m[0, 2] * m[2, 1] - m[0, 1] * m[2, 2]) / det;
        r[0, 2] = (m[0, 1] * m[1, 2] - m[0, 2] * m[1, 1]) / det;
        r[1, 0] = (m[1, 2] * m[2, 0] - m[1, 0] * m[2, 2]) / det;
        r[1, 1] = (m[0, 0] * m[2, 2] - m[0, 2] * m[2, 0]) / det;
        r[1, 2] = (m[0, 2] * m[1, 0] - m[0, 0] * m[1, 2]) / det;
        r[2, 0] = (m[1, 0] * m[2, 1] - m[1, 1] * m[2, 0]) / det;
        r[2, 1] = (m[0, 1] * m[2, 0] - m[0, 0] * m[2, 1]) / det;
        r[2, 2] = (m[0, 0] * m[1, 1] - m[0, 1] * m[1, 0]) / det;
        return r;
    }
}

/// <summary>A spring by neighbour shell between two site kinds (the audit gives every site its label as kind).</summary>
internal sealed record ShellSpring(string From, string To, int Shell, double LongitudinalNPerM, double TransverseNPerM);
