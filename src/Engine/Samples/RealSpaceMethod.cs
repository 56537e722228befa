namespace LatticeSweep.Engine.Samples;

/// <summary>How the real-space part of a <see cref="RealSpaceSample"/> is solved.</summary>
public enum RealSpaceMethod
{
    /// <summary>Dense eigen-solutions while the block fits <see cref="RealSpaceSample.DenseMaxAtoms"/> and the memory limit, else the kernel polynomial method.</summary>
    Auto,

    /// <summary>Always dense (exact modes and eigenvectors); a block too large is refused.</summary>
    Dense,

    /// <summary>Always the kernel polynomial method (stochastic, with its statistical error).</summary>
    KernelPolynomial,
}
