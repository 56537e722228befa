using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Models;

/// <summary>
/// A Bravais lattice in 1, 2 or 3 dimensions. Vectors are stored in metres. A lower-dimensional
/// lattice lives in the x (1D) or xy (2D) plane; its unused vectors are unit placeholders
/// perpendicular to it that never generate neighbours or wave vectors.
/// </summary>
public sealed record Lattice
{
    private Lattice(LatticeKind kind, int dimension, double constantNm, Vec3 a1, Vec3 a2, Vec3 a3)
    {
        Kind = kind;
        Dimension = dimension;
        ConstantNm = constantNm;
        A1M = a1;
        A2M = a2;
        A3M = a3;
        var (b1, b2, b3) = Reciprocal(a1, a2, a3);
        B1PerM = b1;
        B2PerM = b2;
        B3PerM = b3;
    }

    public LatticeKind Kind { get; }

    /// <summary>1, 2 or 3.</summary>
    public int Dimension { get; }

    /// <summary>The lattice constant a users gave (nm); for explicit lattices the length of a1.</summary>
    public double ConstantNm { get; }

    public Vec3 A1M { get; }
    public Vec3 A2M { get; }
    public Vec3 A3M { get; }

    /// <summary>Reciprocal vectors with b_i . a_j = 2 pi delta_ij (1/m).</summary>
    public Vec3 B1PerM { get; }
    public Vec3 B2PerM { get; }
    public Vec3 B3PerM { get; }

    /// <summary>Primitive-cell length (1D, m), area (2D, m^2) or volume (3D, m^3).</summary>
    public double CellMeasure => Dimension switch
    {
        1 => A1M.Length,
        2 => Math.Abs(A1M.Cross(A2M).Z),
        _ => Math.Abs(A1M.Dot(A2M.Cross(A3M))),
    };

    public Vec3 Vector(int i) => i switch { 0 => A1M, 1 => A2M, 2 => A3M, _ => throw new ArgumentOutOfRangeException(nameof(i)) };

    public Vec3 ReciprocalVector(int i) => i switch { 0 => B1PerM, 1 => B2PerM, 2 => B3PerM, _ => throw new ArgumentOutOfRangeException(nameof(i)) };

    /// <summary>
    /// The same lattice with its real vectors (not the placeholders of a 1D or 2D lattice) and its
    /// constant scaled by <paramref name="factor"/>: isotropic expansion or compression.
    /// </summary>
    public Lattice Scaled(double factor)
    {
        Guard.PositiveFinite(factor, "lattice scale", "the scale factor");
        var a1 = factor * A1M;
        var a2 = Dimension >= 2 ? factor * A2M : A2M;
        var a3 = Dimension >= 3 ? factor * A3M : A3M;
        return new Lattice(Kind, Dimension, ConstantNm * factor, a1, a2, a3);
    }

    /// <summary>Cartesian position (m) of fractional coordinates.</summary>
    public Vec3 ToCartesianM(Vec3 fractional) => fractional.X * A1M + fractional.Y * A2M + fractional.Z * A3M;

    /// <summary>Cartesian wave vector (1/m) of reduced coordinates (units of b_i).</summary>
    public Vec3 ToCartesianQ(Vec3 reduced) => reduced.X * B1PerM + reduced.Y * B2PerM + reduced.Z * B3PerM;

    public static Lattice Chain(double aNm) => Build(LatticeKind.Chain, 1, aNm, new(1, 0, 0), new(0, 1, 0), new(0, 0, 1), placeholders: 2);

    public static Lattice Square(double aNm) => Build(LatticeKind.Square, 2, aNm, new(1, 0, 0), new(0, 1, 0), new(0, 0, 1), placeholders: 1);

    /// <summary>2D triangular net, or with <paramref name="cNm"/> the 3D hexagonal lattice.</summary>
    public static Lattice Hexagonal(double aNm, double? cNm = null)
    {
        var s3 = Math.Sqrt(3.0) / 2.0;
        if (cNm is null)
        {
            return Build(LatticeKind.Hexagonal, 2, aNm, new(1, 0, 0), new(0.5, s3, 0), new(0, 0, 1), placeholders: 1);
        }

        Guard.PositiveFinite(cNm.Value, "lattice.c_nm", "the hexagonal c constant");
        return Build(LatticeKind.Hexagonal, 3, aNm, new(1, 0, 0), new(0.5, s3, 0), new(0, 0, cNm.Value / aNm), placeholders: 0);
    }

    public static Lattice SimpleCubic(double aNm) => Build(LatticeKind.SimpleCubic, 3, aNm, new(1, 0, 0), new(0, 1, 0), new(0, 0, 1), placeholders: 0);

    public static Lattice BodyCentredCubic(double aNm) =>
        Build(LatticeKind.BodyCentredCubic, 3, aNm, new(-0.5, 0.5, 0.5), new(0.5, -0.5, 0.5), new(0.5, 0.5, -0.5), placeholders: 0);

    public static Lattice FaceCentredCubic(double aNm) =>
        Build(LatticeKind.FaceCentredCubic, 3, aNm, new(0, 0.5, 0.5), new(0.5, 0, 0.5), new(0.5, 0.5, 0), placeholders: 0);

    /// <summary>
    /// Explicit lattice vectors in nm. One vector (1D) must lie along x, two (2D) in the xy plane.
    /// </summary>
    public static Lattice Explicit(IReadOnlyList<Vec3> vectorsNm)
    {
        ArgumentNullException.ThrowIfNull(vectorsNm);
        var problems = new List<ModelProblem>();
        if (vectorsNm.Count is < 1 or > 3)
        {
            throw new ModelException([new ModelProblem(ModelProblemKind.DimensionMismatch, "lattice.vectors_nm",
                $"give 1, 2 or 3 lattice vectors, not {vectorsNm.Count}")]);
        }

        for (var i = 0; i < vectorsNm.Count; i++)
        {
            if (!vectorsNm[i].IsFinite || vectorsNm[i].Length <= 0)
            {
                problems.Add(new ModelProblem(ModelProblemKind.NonFinite, $"lattice.vectors_nm[{i}]", "each lattice vector must be finite and non-zero"));
            }
        }

        var d = vectorsNm.Count;
        if (d == 1 && (vectorsNm[0].Y != 0 || vectorsNm[0].Z != 0))
        {
            problems.Add(new ModelProblem(ModelProblemKind.DimensionMismatch, "lattice.vectors_nm[0]", "a 1D lattice vector must lie along x: [a, 0, 0]"));
        }

        if (d == 2 && (vectorsNm[0].Z != 0 || vectorsNm[1].Z != 0))
        {
            problems.Add(new ModelProblem(ModelProblemKind.DimensionMismatch, "lattice.vectors_nm", "2D lattice vectors must lie in the xy plane (z = 0)"));
        }

        if (problems.Count > 0)
        {
            throw new ModelException(problems);
        }

        var a = vectorsNm[0].Length;
        var v1 = vectorsNm[0] / a;
        var v2 = d >= 2 ? vectorsNm[1] / a : new Vec3(0, 1, 0);
        var v3 = d >= 3 ? vectorsNm[2] / a : new Vec3(0, 0, 1);
        var volume = Math.Abs(v1.Dot(v2.Cross(v3)));
        if (volume < 1e-9)
        {
            throw new ModelException([new ModelProblem(ModelProblemKind.DimensionMismatch, "lattice.vectors_nm",
                "the lattice vectors are linearly dependent (zero cell volume)")]);
        }

        return Build(LatticeKind.Explicit, d, a, v1, v2, v3, placeholders: 3 - d);
    }

    private static Lattice Build(LatticeKind kind, int dimension, double aNm, Vec3 u1, Vec3 u2, Vec3 u3, int placeholders)
    {
        Guard.PositiveFinite(aNm, "lattice.constant_nm", "the lattice constant");
        var a = aNm * PhysicalConstants.MetresPerNm;

        // Placeholder directions are unit length (1 m), far beyond any neighbour shell, so they never
        // couple periodic images; they only keep the 3D reciprocal construction well defined.
        var a1 = a * u1;
        var a2 = placeholders >= 2 ? u2 : a * u2;
        var a3 = placeholders >= 1 ? u3 : a * u3;
        return new Lattice(kind, dimension, aNm, a1, a2, a3);
    }

    private static (Vec3, Vec3, Vec3) Reciprocal(Vec3 a1, Vec3 a2, Vec3 a3)
    {
        var volume = a1.Dot(a2.Cross(a3));
        var f = 2.0 * Math.PI / volume;
        return (f * a2.Cross(a3), f * a3.Cross(a1), f * a1.Cross(a2));
    }
}
