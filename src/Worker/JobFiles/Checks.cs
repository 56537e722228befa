using System.Globalization;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// Range checks shared by the job-file readers and the sweep axes: each returns what is wrong, or
/// null. The physical ones bound a quantity far outside any crystal (so every value a lattice
/// model could need passes) yet inside what the solver's double arithmetic survives: a mass of
/// 1e-320 amu or a spring of 1e308 N/m would overflow the dynamical matrix to NaN.
/// </summary>
internal static class Checks
{
    /// <summary>Masses: 0.001 amu to 1e6 amu (no atom is lighter than 1 amu or heavier than 300 amu).</summary>
    public static readonly Func<double, string?> MassAmu = PositiveWithin(1e-3, 1e6);

    /// <summary>Lattice constants, spacings and bond lengths: 0.001 nm to 10 µm.</summary>
    public static readonly Func<double, string?> LengthNm = PositiveWithin(1e-3, 1e4);

    /// <summary>Components of explicit lattice vectors: within ±10 µm.</summary>
    public static readonly Func<double, string?> VectorNm = Between(-1e4, 1e4);

    /// <summary>Fractional site positions: within ±1000 cells of the origin.</summary>
    public static readonly Func<double, string?> Fraction = Between(-1e3, 1e3);

    /// <summary>Spring and force constants, either sign: within ±1e6 N/m (interatomic springs are about 1 to 1000 N/m).</summary>
    public static readonly Func<double, string?> SpringNPerM = Between(-1e6, 1e6);

    /// <summary>Positive elastic constants (C11, C44): 0.001 GPa to 10 TPa.</summary>
    public static readonly Func<double, string?> ModulusGpa = PositiveWithin(1e-3, 1e4);

    /// <summary>Elastic constants of either sign (C12): within ±10 TPa.</summary>
    public static readonly Func<double, string?> SignedModulusGpa = Between(-1e4, 1e4);

    /// <summary>
    /// Corners of a dispersion path in reduced coordinates (units of the reciprocal vectors): within ±1000.
    /// A zone is 1 wide, so this reaches a thousand zones out; past it a corner is a typing mistake
    /// (a wave vector in 1/m, an exponent too many) that would sample nothing but repeated zones.
    /// </summary>
    public static readonly Func<double, string?> ReducedWaveVector = Between(-1e3, 1e3);

    /// <summary>Sample lengths: 0.001 nm to 1 m.</summary>
    public static readonly Func<double, string?> SampleLengthNm = PositiveWithin(1e-3, 1e9);

    /// <summary>Smallest magnitude a number other than 0 may have anywhere in a job file.</summary>
    public const double SmallestMagnitude = 1e-300;

    /// <summary>
    /// Refuses a number so close to 0 that it is (or soon becomes) subnormal: a spring of 1e-320 N/m was taken, and its
    /// squares and quotients lose every digit or overflow. 0 itself is fine. (Common practice, no source.)
    /// </summary>
    public static string? NotVanishinglySmall(double v) =>
        v == 0 || Math.Abs(v) >= SmallestMagnitude ? null : $"is too close to 0 to compute with (a number other than 0 needs a magnitude of at least 1e-300); write 0 or a larger value, got {TableReader.Show(v)}";

    public static string? Positive(double v) => v > 0 ? null : $"must be > 0, got {TableReader.Show(v)}";

    public static string? NonNegative(double v) => v >= 0 ? null : $"must be >= 0, got {TableReader.Show(v)}";

    public static string? Any(double v) => null;

    /// <summary>Positive (said so first, the common mistake) and within [min, max].</summary>
    public static Func<double, string?> PositiveWithin(double min, double max) =>
        v => v <= 0 ? Positive(v) : Between(min, max)(v);

    public static Func<double, string?> Between(double min, double max) =>
        v => v >= min && v <= max ? null : $"must be in [{Show(min)}, {Show(max)}], got {TableReader.Show(v)}";

    private static string Show(double v) => v.ToString(CultureInfo.InvariantCulture);
}
