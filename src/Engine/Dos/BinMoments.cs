namespace LatticeSweep.Engine.Dos;

/// <summary>
/// First and second moments of the states in each bin about the bin's centre, so the thermal sums can
/// take each bin by a two-point rule instead of its midpoint: nodes at mu +- sigma (the states' mean
/// and spread inside the bin) with half the states each, exact for every quadratic function of
/// frequency over the bin's own states. The midpoint rule is wrong at first order wherever the states
/// crowd to one side of a bin: at a 1D band edge, g ~ (omega_max - omega)^(-1/2), it left S and F off
/// by about 2e-6 at 2048 bins (falling only as bins^-1.5). Kept for 1D and 2D meshes, whose simplices
/// are few; the states inside a simplex have a density that is a polynomial of degree d - 1 in
/// frequency (piecewise), so each piece's moments are exact by three-point Gauss-Legendre.
/// </summary>
internal sealed class BinMoments
{
    private static readonly double[] Nodes = [-Math.Sqrt(0.6), 0.0, Math.Sqrt(0.6)];
    private static readonly double[] Weights = [5.0 / 9.0, 8.0 / 9.0, 5.0 / 9.0];

    public BinMoments(int bins)
    {
        First = new double[bins];
        Second = new double[bins];
    }

    /// <summary>Sum over states of (f - centre) per bin (states x THz).</summary>
    public double[] First { get; }

    /// <summary>Sum over states of (f - centre)^2 per bin (states x THz^2).</summary>
    public double[] Second { get; }

    /// <summary>
    /// Adds the moments of states with density c0 + c1 u + c2 u^2 (states per THz, u = f - from) on
    /// [from, to] (THz), bin by bin over the bins it overlaps.
    /// </summary>
    public void AddPiece(FrequencyGrid grid, double from, double to, double c0, double c1, double c2)
    {
        if (!(to > from))
        {
            return;
        }

        var first = grid.BinOf(from);
        var last = grid.BinOf(to);
        for (var bin = first; bin <= last; bin++)
        {
            var lo = bin == first ? from : Math.Max(from, grid.Edge(bin));
            var hi = bin == last ? to : Math.Min(to, grid.Edge(bin + 1));
            if (!(hi > lo))
            {
                continue;
            }

            var centre = grid.Centre(bin);
            var half = 0.5 * (hi - lo);
            var middle = 0.5 * (hi + lo);
            for (var g = 0; g < Nodes.Length; g++)
            {
                var f = middle + (half * Nodes[g]);
                var u = f - from;
                var amount = half * Weights[g] * (c0 + (u * (c1 + (u * c2))));
                var x = f - centre;
                First[bin] += amount * x;
                Second[bin] += amount * x * x;
            }
        }
    }

    /// <summary>Adds states that sit at one frequency (THz).</summary>
    public void AddPoint(FrequencyGrid grid, double frequencyThz, double states)
    {
        var bin = grid.BinOf(frequencyThz);
        var x = frequencyThz - grid.Centre(bin);
        First[bin] += states * x;
        Second[bin] += states * x * x;
    }

    /// <summary>
    /// The two nodes of bin b holding <paramref name="states"/>: frequencies (THz) mu -+ sigma about the
    /// centre, half the states each (one node when the spread vanishes).
    /// </summary>
    public (double Low, double High) Nodes2(FrequencyGrid grid, int bin, double states)
    {
        var centre = grid.Centre(bin);
        var mean = First[bin] / states;
        var variance = Math.Max(0.0, (Second[bin] / states) - (mean * mean));
        var sigma = Math.Sqrt(variance);
        return centre + mean - sigma > 0 ? (centre + mean - sigma, centre + mean + sigma) : (centre + mean, centre + mean);
    }
}
