namespace LatticeSweep.Engine.Numerics;

/// <summary>How the batched eigen-solver treats a group of matrices.</summary>
internal enum BatchMethod
{
    /// <summary>The one-matrix solver (Householder + QL), one call per matrix.</summary>
    OneByOne,

    /// <summary>Cyclic Jacobi in SIMD lanes (<see cref="BatchJacobi"/>); eigenvalues and vectors.</summary>
    Jacobi,

    /// <summary>Householder + QL in SIMD lanes (<see cref="BatchTridiagonal"/>); eigenvalues and vectors.</summary>
    Tridiagonal,
}
