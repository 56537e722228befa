using LatticeSweep.Engine.RealSpace;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Solving;

/// <summary>The spectrum of one real-space block with one set of site properties, before it is assembled into a point.</summary>
internal sealed record RealSpaceRun
{
    public required RealSpaceLattice Lattice { get; init; }

    /// <summary>The masses and spring factors the block was solved with.</summary>
    public required SiteProperties Properties { get; init; }

    public required SpectrumStatistics Statistics { get; init; }

    /// <summary>Exact modes of the block (dense solutions); null for the kernel polynomial method.</summary>
    public RealSpaceModes? Modes { get; init; }

    /// <summary>Moments of the kernel polynomial method; null for dense solutions.</summary>
    public KpmSpectrum? Kpm { get; init; }

    /// <summary>Kernel polynomial method: mean-square displacement per displacement channel, [t * channels + c] (m^2); null when not available.</summary>
    public double[]? KpmDisplacements { get; init; }

    /// <summary>Kernel polynomial method: lowest Lanczos Ritz value above the rigid modes (rad^2/s^2).</summary>
    public double KpmLowestRitz { get; init; }

    public required ModeSink Sink { get; init; }

    public required int RigidModes { get; init; }

    public required int RigidRotations { get; init; }

    /// <summary>Largest eigenvalue of D on the rigid rotations before they were projected out (rad^2/s^2).</summary>
    public required double RotationDefectLambda { get; init; }

    /// <summary>"dense", "dense per wave vector" or "kernel polynomial".</summary>
    public required string Method { get; init; }

    public required long QPointsSolved { get; init; }

    public required long ModeCount { get; init; }

    /// <summary>Every frequency (THz) in ascending order when the block was solved at q = 0 alone; else empty.</summary>
    public required double[] SortedThz { get; init; }
}
