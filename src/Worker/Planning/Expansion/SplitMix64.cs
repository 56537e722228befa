namespace LatticeSweep.Worker.Planning.Expansion;

/// <summary>
/// A small seeded generator (SplitMix64, Steele, Lea and Flood, "Fast splittable pseudorandom number
/// generators", OOPSLA 2014) of our own, so that sampled sweeps are the same on every .NET version
/// and machine (System.Random's seeded sequence is not a documented contract).
/// </summary>
internal sealed class SplitMix64
{
    private ulong _state;

    public SplitMix64(ulong seed, ulong stream = 0)
    {
        // Distinct streams for distinct purposes (per axis, per shuffle) from one user seed.
        _state = seed ^ (0x9E3779B97F4A7C15UL * (stream + 1));
    }

    public ulong NextUInt64()
    {
        var z = _state += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    /// <summary>Uniform in [0, 1) with 53 random bits.</summary>
    public double NextDouble() => (NextUInt64() >> 11) * (1.0 / (1UL << 53));

    /// <summary>Uniform integer in [0, n).</summary>
    public int NextInt(int n) => (int)(NextDouble() * n);

    /// <summary>Fisher-Yates shuffle of 0..n-1.</summary>
    public int[] Permutation(int n)
    {
        var p = Enumerable.Range(0, n).ToArray();
        for (var i = n - 1; i > 0; i--)
        {
            var j = NextInt(i + 1);
            (p[i], p[j]) = (p[j], p[i]);
        }

        return p;
    }
}
