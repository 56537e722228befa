using LatticeSweep.Engine.Numerics.Simd;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// Which method the batched eigen-solver uses for an order, at a SIMD width: whichever measured fastest
/// (bench/README.md, "Eigen-solver paths", has the table and the command that measures it).
/// </summary>
internal static class BatchPlan
{
    public static BatchMethod Choose(int n, bool wantVectors, SimdWidth width)
    {
        if (width == SimdWidth.Scalar || n < 2 || n > 32)
        {
            return BatchMethod.OneByOne;
        }

        if (!wantVectors)
        {
            return BatchMethod.Tridiagonal;
        }

        return n <= 24 ? BatchMethod.Jacobi : BatchMethod.OneByOne;
    }
}
