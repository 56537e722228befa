using System.Collections.Immutable;
using LatticeSweep.Engine.Results;

namespace LatticeSweep.Engine.Dos;

/// <summary>Turns states per bin into a density (states per THz per cell).</summary>
internal static class DosAssembly
{
    public static DosCurve FromStates(FrequencyGrid grid, double[] statesPerBin, double[] partialStates, int sites, string method)
    {
        var frequency = ImmutableArray.CreateBuilder<double>(grid.Bins);
        var total = ImmutableArray.CreateBuilder<double>(grid.Bins);
        for (var b = 0; b < grid.Bins; b++)
        {
            frequency.Add(grid.Centre(b));
            total.Add(statesPerBin[b] / grid.WidthThz);
        }

        var partial = ImmutableArray.CreateBuilder<ImmutableArray<double>>(partialStates.Length == 0 ? 0 : sites);
        if (partialStates.Length > 0)
        {
            for (var s = 0; s < sites; s++)
            {
                var curve = new double[grid.Bins];
                for (var b = 0; b < grid.Bins; b++)
                {
                    curve[b] = partialStates[s * grid.Bins + b] / grid.WidthThz;
                }

                partial.Add([.. curve]);
            }
        }

        return new DosCurve(frequency.ToImmutable(), total.ToImmutable(), partial.ToImmutable(), method);
    }
}
