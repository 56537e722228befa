using System.Globalization;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Interactions;

/// <summary>
/// Static lattice sums of a model's pair potentials: energy per atom, pressure, and the isotropic
/// scaling of the lattice that minimises the energy, searched between <see cref="SmallestScale"/>
/// and <see cref="LargestScale"/> times the given lattice constant.
/// </summary>
public static class StaticLattice
{
    public const double SmallestScale = 0.7;
    public const double LargestScale = 1.4;
    private const int ScanPoints = 141;

    /// <summary>Null for a model without potentials; throws <see cref="ModelException"/> when the energy has no minimum in the searched range.</summary>
    public static StaticLatticeResult? Analyse(CrystalModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        if (model.Potentials.IsEmpty)
        {
            return null;
        }

        var curve = new StaticEnergyCurve(model, SmallestScale);
        var s0 = EquilibriumScale(model, curve);
        var (e1, _, _) = curve.At(1);
        var (e0, _, ess0) = curve.At(s0);
        var (dEdV, _) = curve.VolumeDerivatives(1);
        var perAtom = 1.0 / curve.AtomsPerCell / PhysicalConstants.JoulePerEv;
        var threeD = curve.Dimension == 3;
        return new StaticLatticeResult
        {
            EnergyEvPerAtom = e1 * perAtom,
            PressureGpa = threeD ? -dEdV / PhysicalConstants.PascalPerGpa : null,
            EquilibriumScale = s0,
            EquilibriumLatticeConstantNm = model.Lattice.ConstantNm * s0,
            EquilibriumEnergyEvPerAtom = e0 * perAtom,

            // At the minimum dE/ds = 0, so V d2E/dV2 = s^2 E_ss / (d^2 V).
            EquilibriumBulkModulusGpa = threeD ? s0 * s0 * ess0 / (9 * curve.MeasureAt(s0)) / PhysicalConstants.PascalPerGpa : null,
        };
    }

    /// <summary>
    /// The scale factor of the lowest interior local minimum of E(s) on the searched range, refined by
    /// golden-section search. A minimum on the edge of the range is not one: the energy still falls
    /// beyond it (a potential without a well, or the short-range collapse of a Buckingham potential).
    /// </summary>
    internal static double EquilibriumScale(CrystalModel model, StaticEnergyCurve curve)
    {
        var s = new double[ScanPoints];
        var e = new double[ScanPoints];
        for (var k = 0; k < ScanPoints; k++)
        {
            s[k] = SmallestScale + (LargestScale - SmallestScale) * k / (ScanPoints - 1);
            e[k] = curve.At(s[k]).Energy;
        }

        var best = -1;
        for (var k = 1; k < ScanPoints - 1; k++)
        {
            if (e[k] < e[k - 1] && e[k] <= e[k + 1] && (best < 0 || e[k] < e[best]))
            {
                best = k;
            }
        }

        if (best < 0)
        {
            throw NoMinimum(model, e[0] < e[^1]);
        }

        // Golden section on [s_{k-1}, s_{k+1}], which brackets the minimum.
        var (lo, hi) = (s[best - 1], s[best + 1]);
        var g = (Math.Sqrt(5) - 1) / 2;
        var x1 = hi - g * (hi - lo);
        var x2 = lo + g * (hi - lo);
        var f1 = curve.At(x1).Energy;
        var f2 = curve.At(x2).Energy;
        while (hi - lo > 1e-12)
        {
            if (f1 <= f2)
            {
                (hi, x2, f2) = (x2, x1, f1);
                x1 = hi - g * (hi - lo);
                f1 = curve.At(x1).Energy;
            }
            else
            {
                (lo, x1, f1) = (x1, x2, f2);
                x2 = lo + g * (hi - lo);
                f2 = curve.At(x2).Energy;
            }
        }

        // Golden section finds the minimum only to sqrt(machine precision); Newton on dE/ds = 0 with the
        // analytic derivatives finishes it (kept inside the bracket, where a cutoff crossing may leave a kink).
        var x = (lo + hi) / 2;
        var (bracketLo, bracketHi) = (s[best - 1], s[best + 1]);
        for (var iteration = 0; iteration < 20; iteration++)
        {
            var (_, first, second) = curve.At(x);
            if (second <= 0)
            {
                break;
            }

            // Judged by the slope, not the energy: near the minimum energies differ by round-off only.
            var next = x - first / second;
            if (next <= bracketLo || next >= bracketHi || Math.Abs(curve.At(next).First) > Math.Abs(first))
            {
                break;
            }

            var converged = Math.Abs(next - x) <= 1e-15 * x;
            x = next;
            if (converged)
            {
                break;
            }
        }

        return x;
    }

    private static ModelException NoMinimum(CrystalModel model, bool fallsOnContraction)
    {
        var a = model.Lattice.ConstantNm;
        var range = string.Create(CultureInfo.InvariantCulture, $"{SmallestScale * a:G4} to {LargestScale * a:G4} nm ({SmallestScale:G2} to {LargestScale:G2} x the lattice constant {a:G6} nm)");
        var message = fallsOnContraction
            ? $"the static lattice energy of the potentials has no minimum for lattice constants {range}: it keeps falling as the lattice contracts (a Buckingham potential collapses at short range when its repulsion is too weak). Raise repulsion_ev or rho_nm, lower dispersion_ev_nm6, or move the lattice constant nearer the well"
            : $"the static lattice energy of the potentials has no minimum for lattice constants {range}: it keeps falling as the lattice expands (no attraction binds it). Give the potential an attractive part (a well depth, or dispersion_ev_nm6 > 0), or move the lattice constant nearer the well";
        return Guard.Single(ModelProblemKind.OutOfRange, "potentials", message);
    }
}
