namespace LatticeSweep.Engine.Samples;

/// <summary>
/// Settings of the kernel polynomial method (Chebyshev moments of the spectrum estimated with random
/// vectors, Jackson kernel; Weisse, Wellein, Alvermann and Fehske, Rev. Mod. Phys. 78, 275 (2006)).
/// The defaults keep Cv (10 to 300 K) and the integrated density of states of a 10^5-atom free
/// cluster within the reported standard error of a run with twice the moments and twice the vectors
/// (bench/README.md, the surfaces cases).
/// </summary>
public sealed record KpmSettings
{
    /// <summary>Chebyshev moments (the resolution is about pi / moments of the spectral width).</summary>
    public int Moments { get; init; } = 1024;

    /// <summary>Random vectors of the stochastic trace (the statistical error falls as 1/sqrt of this times the atoms).</summary>
    public int RandomVectors { get; init; } = 8;

    /// <summary>Seed of the random vectors (the same seed gives the same numbers).</summary>
    public long Seed { get; init; } = 1;

    public const int MinMoments = 16;
    public const int MaxMoments = 65_536;
    public const int MaxRandomVectors = 4096;
}
