namespace LatticeSweep.Engine.Dos;

/// <summary>Uniform bins from <see cref="StartThz"/> with width <see cref="WidthThz"/>.</summary>
internal readonly record struct FrequencyGrid(double StartThz, double WidthThz, int Bins)
{
    public double EndThz => StartThz + WidthThz * Bins;

    public double Centre(int bin) => StartThz + (bin + 0.5) * WidthThz;

    public double Edge(int k) => StartThz + k * WidthThz;

    /// <summary>Bin holding f, clamped into range.</summary>
    public int BinOf(double frequencyThz)
    {
        var b = (int)Math.Floor((frequencyThz - StartThz) / WidthThz);
        return b < 0 ? 0 : b > Bins - 1 ? Bins - 1 : b; // Math.Clamp's result; precompiled code would call it out of line
    }

    /// <summary>A grid covering [min(0, lowest), highest] with a hair of head-room so the top mode falls inside.</summary>
    public static FrequencyGrid Covering(double lowestThz, double highestThz, int bins)
    {
        var start = Math.Min(0.0, lowestThz);
        var end = Math.Max(highestThz, start + 1e-9) * (1 + 1e-9) + 1e-12;
        return new FrequencyGrid(start, (end - start) / bins, bins);
    }
}
