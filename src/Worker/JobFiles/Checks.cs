using System.Globalization;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>Range checks shared by the job-file readers and the sweep axes: each returns what is wrong, or null.</summary>
internal static class Checks
{
    public static string? Positive(double v) => v > 0 ? null : $"must be > 0, got {TableReader.Show(v)}";

    public static string? NonNegative(double v) => v >= 0 ? null : $"must be >= 0, got {TableReader.Show(v)}";

    public static string? Any(double v) => null;

    public static Func<double, string?> Between(double min, double max) =>
        v => v >= min && v <= max ? null : $"must be in [{min.ToString(CultureInfo.InvariantCulture)}, {max.ToString(CultureInfo.InvariantCulture)}], got {TableReader.Show(v)}";
}
