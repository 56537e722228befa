using System.Runtime.Intrinsics;

namespace LatticeSweep.Engine.Numerics.Simd;

/// <summary>How many matrices the batched eigen-solver handles per vector: its SIMD width.</summary>
internal enum SimdWidth
{
    /// <summary>No SIMD: one matrix at a time (Householder + QL).</summary>
    Scalar = 1,

    /// <summary>256-bit vectors, four matrices per group (AVX2 and FMA).</summary>
    Bits256 = 4,

    /// <summary>512-bit vectors, eight matrices per group (AVX-512; emulated where the processor lacks it).</summary>
    Bits512 = 8,
}

/// <summary>
/// The width the batched kernels use, fixed at start: the widest vector the processor runs natively
/// (512-bit with AVX-512, 256-bit with AVX2, scalar otherwise), unless the environment variable
/// <see cref="EnvironmentVariable"/> forces one (<c>512</c>, <c>256</c>, <c>scalar</c>; <c>auto</c> or unset
/// is the hardware's choice). Forcing 512 on a processor without AVX-512 runs correctly but slowly
/// (the runtime emulates it): that is for tests and benchmarks, not for production.
/// </summary>
internal static class SimdWidths
{
    public const string EnvironmentVariable = "LATSWEEP_SIMD_WIDTH";

    private static readonly Lazy<SimdWidth> ActiveWidth = new(() => Parse(Environment.GetEnvironmentVariable(EnvironmentVariable)));

    /// <summary>The widest vector the processor runs natively.</summary>
    public static SimdWidth Hardware =>
        Vector512.IsHardwareAccelerated ? SimdWidth.Bits512
        : Vector256.IsHardwareAccelerated ? SimdWidth.Bits256
        : SimdWidth.Scalar;

    /// <summary>The width in force for this process.</summary>
    /// <exception cref="InvalidOperationException">The environment variable holds something else than the allowed values.</exception>
    public static SimdWidth Active => ActiveWidth.Value;

    /// <summary>The width a setting names; null or empty or <c>auto</c> is <see cref="Hardware"/>.</summary>
    /// <exception cref="InvalidOperationException">Not one of auto, 512, 256, scalar.</exception>
    public static SimdWidth Parse(string? setting) => setting?.Trim().ToLowerInvariant() switch
    {
        null or "" or "auto" => Hardware,
        "512" => SimdWidth.Bits512,
        "256" => SimdWidth.Bits256,
        "scalar" => SimdWidth.Scalar,
        _ => throw new InvalidOperationException(
            $"The environment variable {EnvironmentVariable} is '{setting}'; allowed: auto (or unset), 512, 256, scalar."),
    };

    /// <summary>A label for reports: "512-bit (AVX-512)", "256-bit", "scalar".</summary>
    public static string Describe(SimdWidth width) => width switch
    {
        SimdWidth.Bits512 => Vector512.IsHardwareAccelerated ? "512-bit" : "512-bit (emulated)",
        SimdWidth.Bits256 => Vector256.IsHardwareAccelerated ? "256-bit" : "256-bit (emulated)",
        _ => "scalar",
    };
}
