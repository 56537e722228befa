namespace LatticeSweep.Engine.Models;

/// <summary>A real 3x3 tensor (force constants in N/m), row-major.</summary>
public readonly record struct Matrix3(
    double Xx, double Xy, double Xz,
    double Yx, double Yy, double Yz,
    double Zx, double Zy, double Zz)
{
    public static Matrix3 Zero => default;

    public double this[int row, int column] => (row * 3 + column) switch
    {
        0 => Xx, 1 => Xy, 2 => Xz,
        3 => Yx, 4 => Yy, 5 => Yz,
        6 => Zx, 7 => Zy, 8 => Zz,
        _ => throw new ArgumentOutOfRangeException(nameof(row), "row and column must be 0..2"),
    };

    /// <summary>Outer product s * u u^T.</summary>
    public static Matrix3 Outer(Vec3 u, double s) => new(
        s * u.X * u.X, s * u.X * u.Y, s * u.X * u.Z,
        s * u.Y * u.X, s * u.Y * u.Y, s * u.Y * u.Z,
        s * u.Z * u.X, s * u.Z * u.Y, s * u.Z * u.Z);

    /// <summary>Outer product s * u v^T (not symmetric unless u and v are parallel).</summary>
    public static Matrix3 Outer(Vec3 u, Vec3 v, double s) => new(
        s * u.X * v.X, s * u.X * v.Y, s * u.X * v.Z,
        s * u.Y * v.X, s * u.Y * v.Y, s * u.Y * v.Z,
        s * u.Z * v.X, s * u.Z * v.Y, s * u.Z * v.Z);

    public static Matrix3 Diagonal(double d) => new(d, 0, 0, 0, d, 0, 0, 0, d);

    public static Matrix3 FromRows(IReadOnlyList<double> nine)
    {
        ArgumentNullException.ThrowIfNull(nine);
        if (nine.Count != 9)
        {
            throw new ArgumentException("a 3x3 tensor needs 9 numbers, row by row", nameof(nine));
        }

        return new(nine[0], nine[1], nine[2], nine[3], nine[4], nine[5], nine[6], nine[7], nine[8]);
    }

    public static Matrix3 operator +(Matrix3 a, Matrix3 b) => new(
        a.Xx + b.Xx, a.Xy + b.Xy, a.Xz + b.Xz,
        a.Yx + b.Yx, a.Yy + b.Yy, a.Yz + b.Yz,
        a.Zx + b.Zx, a.Zy + b.Zy, a.Zz + b.Zz);

    public static Matrix3 operator -(Matrix3 a) => new(-a.Xx, -a.Xy, -a.Xz, -a.Yx, -a.Yy, -a.Yz, -a.Zx, -a.Zy, -a.Zz);

    public static Matrix3 operator *(double s, Matrix3 a) => new(
        s * a.Xx, s * a.Xy, s * a.Xz, s * a.Yx, s * a.Yy, s * a.Yz, s * a.Zx, s * a.Zy, s * a.Zz);

    public Matrix3 Transpose() => new(Xx, Yx, Zx, Xy, Yy, Zy, Xz, Yz, Zz);

    public double Trace => Xx + Yy + Zz;

    public bool IsFinite =>
        double.IsFinite(Xx) && double.IsFinite(Xy) && double.IsFinite(Xz) &&
        double.IsFinite(Yx) && double.IsFinite(Yy) && double.IsFinite(Yz) &&
        double.IsFinite(Zx) && double.IsFinite(Zy) && double.IsFinite(Zz);
}
