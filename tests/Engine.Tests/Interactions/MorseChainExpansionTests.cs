using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QuasiHarmonic;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Interactions;

/// <summary>
/// The quasi-harmonic expansion of an invented Morse chain (scalar motion, nearest neighbours only,
/// a periodic ring of N atoms) against a reference that shares nothing with the solver: its modes
/// are the closed form w_n = 2 sqrt(phi''(a)/m) |sin(pi n / N)| (Ashcroft and Mermin, ch. 22, from
/// memory), and its lattice constant at each temperature is the root of dF/da = 0 with
/// F(a, T) = phi(a) + (1/N) sum_n [hbar w_n / 2 + kB T ln(1 - exp(-hbar w_n / kB T))], found by bisection
/// (no volume grid, no fit). Since every w_n scales as sqrt(phi''), dF/da = phi' + (phi'''/(2 phi'')) u,
/// u the vibrational energy per atom, zero-point energy included (quasi-harmonic free energy,
/// Ashcroft and Mermin, ch. 25, from memory).
/// </summary>
public class MorseChainExpansionTests
{
    private const int Atoms = 64;
    private const double R0Nm = 0.29;

    private static readonly Morse Usual = new(MassAmu: 30, DepthEv: 0.3, WidthPerNm: 15);

    private static readonly double[] Temperatures = [0, 20, 49.5, 50, 50.5, 299.5, 300, 300.5, 500];

    private static double Phi2(double aM) => Usual.Phi2(aM);

    private static double Phi3(double aM) => Usual.Phi3(aM);

    private static IEnumerable<double> Omegas(double aM, int atoms, Morse? p = null) =>
        Enumerable.Range(1, atoms - 1).Select(n => 2 * Math.Sqrt((p ?? Usual).Phi2(aM) / ((p ?? Usual).MassAmu * PhysicalConstants.AtomicMassKg)) * Math.Abs(Math.Sin(Math.PI * n / atoms)));

    /// <summary>Vibrational energy per atom, J, zero-point energy included.</summary>
    private static double EnergyPerAtom(double aM, double t, int atoms, Morse? p = null) => Omegas(aM, atoms, p).Sum(w =>
    {
        var quantum = PhysicalConstants.HbarJS * w;
        return quantum / 2 + (t > 0 ? quantum / double.ExpM1(quantum / (PhysicalConstants.BoltzmannJPerK * t)) : 0);
    }) / atoms;

    private static double HeatCapacityPerMol(double aM, double t, int atoms = Atoms) => Omegas(aM, atoms).Sum(w =>
    {
        var x = PhysicalConstants.HbarJS * w / (PhysicalConstants.BoltzmannJPerK * t);
        return x * x * Math.Exp(x) / (double.ExpM1(x) * double.ExpM1(x));
    }) / atoms * PhysicalConstants.GasConstantJPerMolK;

    private static double Force(double aM, double t, int atoms = Atoms, Morse? p = null) =>
        (p ?? Usual).Phi1(aM) + ((p ?? Usual).Phi3(aM) / (2 * (p ?? Usual).Phi2(aM)) * EnergyPerAtom(aM, t, atoms, p));

    /// <summary>The root of dF/da between the static minimum and 10 % beyond it.</summary>
    private static double LatticeConstantM(double t, int atoms = Atoms, Morse? p = null)
    {
        var (lo, hi) = (R0Nm * 1e-9, R0Nm * 1.1e-9);
        for (var i = 0; i < 200 && hi - lo > 1e-24; i++)
        {
            var mid = (lo + hi) / 2;
            (lo, hi) = Force(mid, t, atoms, p) < 0 ? (mid, hi) : (lo, mid);
        }

        return (lo + hi) / 2;
    }

    private static ExpansionRow[] Solve() => Solve(Atoms, Temperatures, new ExpansionOptions { VolumeCount = 9, LargestLinearStrain = 0.03 });

    private static ExpansionRow[] Solve(int atoms, double[] temperatures, ExpansionOptions expansion, Morse? p = null)
    {
        var morse = p ?? Usual;
        var chain = CrystalModel.Create(
            Lattice.Chain(0.3), [new Site("M", "M", Vec3.Zero, morse.MassAmu)], degreesOfFreedom: DegreesOfFreedom.Scalar,
            potentials: [new PotentialTerm("M", "M", new MorsePotential(morse.DepthEv, R0Nm, morse.WidthPerNm), 0.45, ShiftAtCutoff: false)]);
        var relaxed = chain.Scaled(StaticLattice.Analyse(chain)!.EquilibriumScale);
        var options = new SolveOptions
        {
            TemperaturesK = [.. temperatures],
            ReferenceTemperatureK = temperatures[^1],
            PartialDos = false,
            MeanSquareDisplacement = false,
            Expansion = expansion,
        };
        return [.. PhononSolver.Solve(relaxed, FiniteSample.Create(atoms), options).Expansion!.Rows];
    }

    [Fact]
    public void Lattice_constant_modulus_and_heat_capacity_follow_the_closed_form_free_energy()
    {
        var rows = Solve();
        Assert.Equal(Temperatures.Length, rows.Length);
        for (var i = 0; i < rows.Length; i++)
        {
            var t = Temperatures[i];
            var row = rows[i];
            Assert.Null(row.Breakdown);
            var a = LatticeConstantM(t);
            // The solver minimises a polynomial fit of F over the volumes solved: 2e-7 off at 500 K (3.5 % strain).
            Approx.Equal(a * 1e9, row.LatticeConstantNm!.Value, 1e-6, $"a({t} K)");
            Approx.Equal(a / (R0Nm * 1e-9), row.VolumeRatio!.Value, 1e-6, $"L / L_static ({t} K)");

            // Isothermal length modulus a d2F/da2 per atom (1D), from dF/da by a central difference.
            var h = 1e-6 * a;
            var modulus = a * (Force(a + h, t) - Force(a - h, t)) / (2 * h);
            Approx.Equal(modulus, row.IsothermalBulkModulusN!.Value, 1e-4, $"B_T ({t} K)");

            // The solver takes Cv at V(T) from its fit over the volumes solved: round-off and fit, ~1e-7 here.
            var cv = t > 0 ? HeatCapacityPerMol(a, t) : 0;
            Approx.Equal(cv, row.CvJPerMolK!.Value, 1e-6, $"Cv at a(T) ({t} K)", absolute: 1e-12);
        }
    }

    [Fact]
    public void The_expansion_coefficient_is_the_slope_of_the_closed_form_lattice_constant()
    {
        var rows = Solve();
        foreach (var t in new[] { 50.0, 300.0 })
        {
            var slope = (LatticeConstantM(t + 0.5) - LatticeConstantM(t - 0.5)) / LatticeConstantM(t);
            var row = rows[Array.IndexOf(Temperatures, t)];
            Approx.Equal(slope, row.LinearExpansionPerK!.Value, 2e-3, $"alpha_L ({t} K)");
            Approx.Equal(row.LinearExpansionPerK.Value, row.VolumeExpansionPerK!.Value, 1e-12, "1D: alpha_V = alpha_L");
        }

        // A Morse bond stiffens on compression (phi''' < 0), so the chain expands, and more so when hot.
        Assert.Equal(0, rows[0].LinearExpansionPerK);
        Assert.True(rows[^1].LinearExpansionPerK > rows[Array.IndexOf(Temperatures, 300.0)].LinearExpansionPerK);
    }

    /// <summary>
    /// Far below the lowest mode of a small ring (8 atoms: hbar w_min / kB = 121 K) S and Cv fall as
    /// exp(-hbar w_min / kB T) and change some fifty times across five volumes 4 % apart. Every mode of
    /// a nearest-neighbour chain has the same Grueneisen parameter, gamma = -d ln w / d ln a =
    /// -a phi''' / (2 phi''), so the thermal one (the Cv-weighted mean of the mode parameters) is that
    /// at a(T) at every temperature, and alpha_L = gamma Cv / (a B) per atom, B = a d2F/da2
    /// (Ashcroft and Mermin, ch. 25, from memory). A polynomial fit of S and Cv themselves gave Cv 86 %
    /// low at 4 K (Cv = 3.5e-11 R) and gamma -952, -8.5, 3.24 and 5.44 at 4, 6, 8 and 10 K against 6.657.
    /// </summary>
    [Fact]
    public void Far_below_the_lowest_mode_of_a_small_ring_gamma_cv_and_alpha_keep_their_relative_accuracy()
    {
        const int ring = 8;
        double[] temperatures = [0, 4, 6, 8, 10, 300];
        var rows = Solve(ring, temperatures, new ExpansionOptions { VolumeCount = 5, LargestLinearStrain = 0.04 });
        for (var i = 1; i < temperatures.Length; i++)
        {
            var t = temperatures[i];
            var row = rows[i];
            Assert.Null(row.Breakdown);
            var a = LatticeConstantM(t, ring);
            var cv = HeatCapacityPerMol(a, t, ring);
            Approx.Equal(cv, row.CvJPerMolK!.Value, 2e-4, $"Cv at a(T) ({t} K)");

            var gamma = -a * Phi3(a) / (2 * Phi2(a));
            Approx.Equal(gamma, row.Grueneisen!.Value, 2e-4, $"gamma ({t} K)");

            var h = 1e-6 * a;
            var modulus = a * (Force(a + h, t, ring) - Force(a - h, t, ring)) / (2 * h);
            var alpha = gamma * cv / PhysicalConstants.GasConstantJPerMolK * PhysicalConstants.BoltzmannJPerK / (a * modulus);
            // 1.2e-3 off at 300 K: B_T from the fit of F over five volumes 4 % apart.
            Approx.Equal(alpha, row.LinearExpansionPerK!.Value, 2e-3, $"alpha_L ({t} K)");
        }

        Assert.Null(rows[0].Grueneisen);
        Assert.Equal(0, rows[0].CvJPerMolK);
    }

    /// <summary>
    /// A light atom (2 amu) in a narrow well (0.1 eV, 25 /nm): the zero-point motion alone stretches the ring 4.3 % past the
    /// static minimum, so F_vib bends strongly over the default volumes (seven, 0.8 % apart in strain). A least-squares
    /// quartic of F_vib through them put B_T 3.1e-3 (0 K) to 4.6e-3 (50 K) above the closed form; the polynomial through
    /// every volume of the window is within 7e-5 (NumPy emulation of both fits on the closed form, common practice, no source).
    /// </summary>
    [Fact]
    public void A_strongly_anharmonic_ring_keeps_its_modulus_on_the_default_volumes()
    {
        const int ring = 16;
        var light = new Morse(MassAmu: 2, DepthEv: 0.1, WidthPerNm: 25);
        double[] temperatures = [0, 20, 50];
        var rows = Solve(ring, temperatures, new ExpansionOptions(), light);
        for (var i = 0; i < temperatures.Length; i++)
        {
            var t = temperatures[i];
            var row = rows[i];
            Assert.Null(row.Breakdown);
            var a = LatticeConstantM(t, ring, light);
            Assert.True(a > 1.04 * R0Nm * 1e-9, $"zero-point expansion {a / (R0Nm * 1e-9)}");
            Approx.Equal(a * 1e9, row.LatticeConstantNm!.Value, 1e-6, $"a({t} K)");
            var h = 1e-6 * a;
            var modulus = a * (Force(a + h, t, ring, light) - Force(a - h, t, ring, light)) / (2 * h);
            Approx.Equal(modulus, row.IsothermalBulkModulusN!.Value, 2e-4, $"B_T ({t} K)");
        }
    }

    /// <summary>Morse pair potential phi(a) = D (e^2 - 2 e), e = exp(-w (a - r0)), and its derivatives (J, m).</summary>
    private sealed record Morse(double MassAmu, double DepthEv, double WidthPerNm)
    {
        private double D => DepthEv * PhysicalConstants.JoulePerEv;

        private double Alpha => WidthPerNm / PhysicalConstants.MetresPerNm;

        public double Phi1(double aM) => 2 * D * Alpha * (E(aM) - (E(aM) * E(aM)));

        public double Phi2(double aM) => D * Alpha * Alpha * ((4 * E(aM) * E(aM)) - (2 * E(aM)));

        public double Phi3(double aM) => D * Alpha * Alpha * Alpha * ((2 * E(aM)) - (8 * E(aM) * E(aM)));

        private double E(double aM) => Math.Exp(-Alpha * (aM - (R0Nm * PhysicalConstants.MetresPerNm)));
    }
}
