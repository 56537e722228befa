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
    private const int ScanPoints = 57;

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
    /// The scale factor of the lowest interior local minimum of E(s) on the searched range (a scan in
    /// steps of 1.25 %), refined to round-off. A minimum on the edge of the range is not one: the
    /// energy still falls beyond it (a potential without a well, or the short-range collapse of a
    /// Buckingham potential).
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

        // [s_{k-1}, s_{k+1}] brackets the minimum: Newton on dE/ds = 0 with the analytic derivatives, kept
        // inside a bracket that shrinks by the sign of dE/ds (bisection where Newton would leave it; a
        // pair crossing the cutoff leaves a kink where only the bisection is safe).
        var (lo, hi) = (s[best - 1], s[best + 1]);
        var x = s[best];
        for (var iteration = 0; iteration < 100 && hi - lo > 1e-15 * x; iteration++)
        {
            var (_, first, second) = curve.At(x);
            if (first > 0)
            {
                hi = x;
            }
            else
            {
                lo = x;
            }

            var next = second > 0 ? x - first / second : double.NaN;
            if (Math.Abs(next - x) <= 1e-15 * x)
            {
                // Converged: the last step is round-off (it may touch the bracket end x just became).
                x = Math.Clamp(next, lo, hi);
                break;
            }

            x = next > lo && next < hi ? next : (lo + hi) / 2;
        }

        return x;
    }

    private static ModelException NoMinimum(CrystalModel model, bool fallsOnContraction)
    {
        var a = model.Lattice.ConstantNm;
        var range = string.Create(CultureInfo.InvariantCulture, $"{SmallestScale * a:G4} to {LargestScale * a:G4} nm ({SmallestScale:G2} to {LargestScale:G2} x the lattice constant {a:G6} nm)");
        // Only a Buckingham potential collapses; Lennard-Jones and Morse wells whose many neighbours pull the
        // lattice in put the minimum below the searched range instead, so the hint names what to change.
        var collapse = model.Potentials.Any(p => p.Potential is BuckinghamPotential)
            ? "(a Buckingham potential collapses at short range when its repulsion is too weak). Raise repulsion_ev or rho_nm, lower dispersion_ev_nm6, or move the lattice constant nearer the well"
            : "(its minimum lies below the range searched: the neighbours within the cutoff pull the lattice in). Give a smaller constant_nm, nearer the minimum, or a shorter cutoff_nm";
        var message = fallsOnContraction
            ? $"the static lattice energy of the potentials has no minimum for lattice constants {range}: it keeps falling as the lattice contracts {collapse}"
            : $"the static lattice energy of the potentials has no minimum for lattice constants {range}: it keeps falling as the lattice expands (no attraction binds it). Give the potential an attractive part (a well depth, or dispersion_ev_nm6 > 0), or move the lattice constant nearer the well";
        return Guard.Single(ModelProblemKind.OutOfRange, "potentials", message);
    }
}
