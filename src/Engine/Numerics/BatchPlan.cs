using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Which method the batched eigen-solver uses for an order at a SIMD width: whichever measured fastest.
/// The thresholds come from `bench/run.sh eigen-paths` (every width and method timed in turns, per
/// order 2..48, eigenvalues alone and with vectors); bench/README.md, "Eigen-solver paths", has the
/// table, the machine and the load. In short: for eigenvalues alone, Householder + QL in lanes wins
/// from 3x3 up (2.5-4x the Jacobi at 12-24, 4x the one-matrix solver at 48), and at 2x2 Jacobi's single
/// rotation is a little faster; with vectors, Jacobi in lanes wins up to 24 on 512-bit vectors and up to
/// 12 on 256-bit ones, above which its n^3 rotations per sweep lose to the one-matrix solver.
/// </summary>
internal static class BatchPlan
{
    /// <summary>Largest order measured for the lane-parallel Householder + QL; above it, one matrix at a time.</summary>
    public const int TridiagonalMaxOrder = 48;

    public static BatchMethod Choose(int n, bool wantVectors, SimdWidth width)
    {
        if (width == SimdWidth.Scalar || n < 2)
        {
            return BatchMethod.OneByOne;
        }

        if (!wantVectors)
        {
            return n == 2 ? BatchMethod.Jacobi
                : n <= TridiagonalMaxOrder ? BatchMethod.Tridiagonal
                : BatchMethod.OneByOne;
        }

        var jacobiMaxOrder = width == SimdWidth.Bits512 ? 24 : 12;
        return n <= jacobiMaxOrder ? BatchMethod.Jacobi : BatchMethod.OneByOne;
    }
}
