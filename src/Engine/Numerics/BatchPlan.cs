using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Which method the batched eigen-solver uses for an order at a SIMD width: whichever measured fastest.
/// The thresholds come from `bench/run.sh eigen-paths` (every width and method timed in turns, per
/// order 2..48, eigenvalues alone and with vectors); bench/README.md, "Eigen-solver paths", has the
/// table, the machine and the load. Householder + QL in lanes wins from 3x3 up to the largest order
/// measured, on both widths, with and without vectors (1.3-3x the Jacobi in lanes, 2.5-5x the
/// one-matrix solver); at 2x2 the Jacobi's single rotation is a little faster. Above 48 the one-matrix
/// solver takes over (not measured beyond; the lanes' work space grows as n^2 per lane).
/// </summary>
internal static class BatchPlan
{
    /// <summary>Largest order measured for the lane-parallel Householder + QL; above it, one matrix at a time.</summary>
    public const int TridiagonalMaxOrder = 48;

    public static BatchMethod Choose(int n, bool wantVectors, SimdWidth width) =>
        width == SimdWidth.Scalar || n < 2 || n > TridiagonalMaxOrder ? BatchMethod.OneByOne
        : n == 2 ? BatchMethod.Jacobi
        : BatchMethod.Tridiagonal;
}
