using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Interactions;

/// <summary>
/// The static lattice energy of a model's potentials per primitive cell as a function of an
/// isotropic scale factor s of the lattice (s = 1: the geometry as given), with its first two
/// derivatives. Pair distances are collected once, out to the cutoff at the smallest scale searched.
/// </summary>
internal sealed class StaticEnergyCurve
{
    private readonly (PairPotential Potential, double CutoffM, double ShiftJ, double[] DistancesM)[] _terms;

    /// <param name="model">The model at scale 1.</param>
    /// <param name="smallestScale">Pairs are collected out to the cutoff at this scale.</param>
    /// <param name="frozenAtScale">When given, the pairs within the cutoff at this scale interact at every
    /// scale and no others (each still shifted by phi(cutoff)): E(s) is then smooth, as the quasi-harmonic
    /// fit needs; otherwise pairs enter and leave as they cross the cutoff.</param>
    public StaticEnergyCurve(CrystalModel model, double smallestScale, double? frozenAtScale = null)
    {
        var positions = model.Sites.Select(s => model.Lattice.ToCartesianM(s.Fractional)).ToArray();
        _terms = new (PairPotential, double, double, double[])[model.Potentials.Length];
        for (var t = 0; t < _terms.Length; t++)
        {
            var term = model.Potentials[t];
            var cutoff = term.CutoffNm * 1e-9;
            var pairs = PotentialSprings.Pairs(model, positions, t, cutoff / (frozenAtScale ?? smallestScale));
            var shift = term.ShiftAtCutoff ? term.Potential.EnergyJ(cutoff) : 0.0;
            _terms[t] = (term.Potential, frozenAtScale is null ? cutoff : double.PositiveInfinity, shift, [.. pairs.Select(p => p.SeparationM.Length).Order()]);
        }

        Dimension = model.Lattice.Dimension;
        CellMeasure = model.Lattice.CellMeasure;
        AtomsPerCell = model.Sites.Length;
    }

    /// <summary>1, 2 or 3: the power of s the cell measure scales with.</summary>
    public int Dimension { get; }

    /// <summary>Cell length, area or volume at s = 1 (m, m^2, m^3).</summary>
    public double CellMeasure { get; }

    public int AtomsPerCell { get; }

    /// <summary>Cell measure at scale s.</summary>
    public double MeasureAt(double s) => CellMeasure * Math.Pow(s, Dimension);

    /// <summary>E(s), dE/ds and d2E/ds2 per cell (J), each pair inside its cutoff at scale s.</summary>
    public (double Energy, double First, double Second) At(double s)
    {
        double e = 0, first = 0, second = 0;
        foreach (var (potential, cutoff, shift, distances) in _terms)
        {
            foreach (var r0 in distances)
            {
                var r = s * r0;
                if (r >= cutoff)
                {
                    break; // sorted: every further pair is outside too
                }

                e += potential.EnergyJ(r) - shift;
                first += r0 * potential.FirstDerivativeJPerM(r);
                second += r0 * r0 * potential.SecondDerivativeNPerM(r);
            }
        }

        return (e, first, second);
    }

    /// <summary>dE/dV and d2E/dV2 per cell from the derivatives in s (V = V1 s^d), in J/m^d and J/m^(2d).</summary>
    public (double First, double Second) VolumeDerivatives(double s)
    {
        var (_, es, ess) = At(s);
        var d = Dimension;
        var v = MeasureAt(s);
        var first = es * s / (d * v);
        var second = (ess * s * s + es * s * (1 - d)) / (d * d * v * v);
        return (first, second);
    }
}
