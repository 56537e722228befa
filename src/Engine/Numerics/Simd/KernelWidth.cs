namespace LatticeSweep.Engine.Numerics.Simd;

/// <summary>
/// The width of the Engine's batched kernels in this process, for callers outside the Engine that
/// depend on it (the Worker's run-time forecast takes its coefficients per width).
/// </summary>
public static class KernelWidth
{
    /// <summary>Bits per vector of the batched kernels: 512, 256, or 64 for the scalar path (one double at a time).</summary>
    /// <remarks>
    /// The width in force (<c>LATSWEEP_SIMD_WIDTH</c> or the hardware's); where that variable holds a value
    /// the Engine refuses, the hardware's width (the solve itself reports the bad setting).
    /// </remarks>
    public static int ActiveBits
    {
        get
        {
            SimdWidth width;
            try
            {
                width = SimdWidths.Active;
            }
            catch (InvalidOperationException)
            {
                width = SimdWidths.Hardware;
            }

            return width switch { SimdWidth.Bits512 => 512, SimdWidth.Bits256 => 256, _ => 64 };
        }
    }
}
