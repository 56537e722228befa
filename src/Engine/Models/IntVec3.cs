namespace LatticeSweep.Engine.Models;

/// <summary>An integer lattice translation (cell offset) n1 a1 + n2 a2 + n3 a3.</summary>
public readonly record struct IntVec3(int N1, int N2, int N3)
{
    public static IntVec3 Zero => default;

    public static IntVec3 operator -(IntVec3 a) => new(-a.N1, -a.N2, -a.N3);

    public static IntVec3 operator +(IntVec3 a, IntVec3 b) => new(a.N1 + b.N1, a.N2 + b.N2, a.N3 + b.N3);

    public static IntVec3 operator -(IntVec3 a, IntVec3 b) => new(a.N1 - b.N1, a.N2 - b.N2, a.N3 - b.N3);

    public Vec3 AsVec3() => new(N1, N2, N3);
}
