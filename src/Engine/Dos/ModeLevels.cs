using System.Collections.Immutable;
using LatticeSweep.Engine.Results;

namespace LatticeSweep.Engine.Dos;

/// <summary>The exact spectrum of a finite crystal as distinct frequencies with multiplicities.</summary>
internal static class ModeLevels
{
    /// <summary>
    /// Groups sorted frequencies that agree within 1e-9 of the highest frequency (round-off of the
    /// eigen-solver is far below that; true near-degeneracies of a finite crystal are far above it).
    /// The rigid translations are added at zero.
    /// </summary>
    public static ImmutableArray<ModeLevel> Distinct(double[] frequenciesThz, long count, int rigidModes)
    {
        var sorted = frequenciesThz.AsSpan(0, (int)count).ToArray();
        Array.Sort(sorted);
        var top = sorted.Length == 0 ? 0 : Math.Max(Math.Abs(sorted[0]), Math.Abs(sorted[^1]));
        var tolerance = 1e-9 * top;
        var levels = ImmutableArray.CreateBuilder<ModeLevel>();
        if (rigidModes > 0)
        {
            levels.Add(new ModeLevel(0.0, rigidModes));
        }

        var i = 0;
        while (i < sorted.Length)
        {
            var j = i + 1;
            while (j < sorted.Length && sorted[j] - sorted[i] <= tolerance)
            {
                j++;
            }

            var mean = 0.0;
            for (var k = i; k < j; k++)
            {
                mean += sorted[k];
            }

            mean /= j - i;
            if (Math.Abs(mean) <= tolerance && levels.Count > 0 && levels[0].FrequencyThz == 0.0)
            {
                levels[0] = levels[0] with { Multiplicity = levels[0].Multiplicity + (j - i) };
            }
            else
            {
                levels.Add(new ModeLevel(Math.Abs(mean) <= tolerance ? 0.0 : mean, j - i));
            }

            i = j;
        }

        return levels.ToImmutable();
    }
}
