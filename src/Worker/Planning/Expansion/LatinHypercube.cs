namespace LatticeSweep.Worker.Planning.Expansion;

/// <summary>
/// Latin-hypercube sampling of the unit cube (McKay, Beckman and Conover, Technometrics 21, 1979):
/// each of the <c>count</c> equal strata of every axis holds exactly one sample, at a random spot inside it.
/// </summary>
internal static class LatinHypercube
{
    /// <summary>
    /// Samples[i, j] in [0, 1): sample i, axis j. One array for every sample (a million samples as arrays of
    /// their own were a million objects the GC kept walking for the whole run).
    /// </summary>
    public static double[,] Sample(int count, int axes, ulong seed)
    {
        var samples = new double[count, axes];
        for (var j = 0; j < axes; j++)
        {
            var rng = new SplitMix64(seed, (ulong)(1000 + j));
            var strata = rng.Permutation(count);
            for (var i = 0; i < count; i++)
            {
                samples[i, j] = (strata[i] + rng.NextDouble()) / count;
            }
        }

        return samples;
    }

    /// <summary>Plain Monte-Carlo samples of the unit cube, as <see cref="Sample"/> lays them out.</summary>
    public static double[,] Random(int count, int axes, ulong seed)
    {
        var rng = new SplitMix64(seed, 999);
        var samples = new double[count, axes];
        for (var i = 0; i < count; i++)
        {
            for (var j = 0; j < axes; j++)
            {
                samples[i, j] = rng.NextDouble();
            }
        }

        return samples;
    }
}
