using LatticeSweep.Engine.Elastic;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Interactions;

public class PairPotentialTests
{
    // Invented Lennard-Jones parameters (the results are in units of epsilon and sigma anyway).
    private const double Epsilon = 0.0104, Sigma = 0.34;

    private static CrystalModel LjFcc(double aNm, double cutoffNm, bool shift = false, DegreesOfFreedom dof = DegreesOfFreedom.Cartesian) =>
        CrystalModel.Create(Lattice.FaceCentredCubic(aNm), [new Site("X", "X", Vec3.Zero, 40)], degreesOfFreedom: dof,
            potentials: [new PotentialTerm("X", "X", new LennardJonesPotential(Epsilon, Sigma), cutoffNm, shift)]);

    [Fact]
    public void Fcc_lattice_sums_are_the_textbook_A12_and_A6()
    {
        // sum over the lattice of (r_nn / r)^n: A12 = 12.13188, A6 = 14.45392 (Kittel, Introduction to Solid
        // State Physics, ch. 3; Ashcroft and Mermin, ch. 20). Sums to 20 nearest-neighbour distances, the r^-6
        // tail beyond added as the continuum integral 4 pi n / (3 R^3) (n = sqrt 2 sites per r_nn^3).
        const double radius = 20;
        var model = LjFcc(Math.Sqrt(2), 1);
        var positions = new[] { Vec3.Zero };
        var pairs = PotentialSprings.Pairs(model, positions, 0, radius * 1e-9);
        double Sum(int n) => 2 * pairs.Sum(p => Math.Pow(p.SeparationM.Length * 1e9, -n)); // each pair once: both ends
        var a6 = Sum(6) + 4 * Math.PI * Math.Sqrt(2) / (3 * radius * radius * radius);
        Approx.Equal(12.13188, Sum(12), 2e-7, "A12");
        Approx.Equal(14.45392, a6, 2e-6, "A6");
        Assert.Equal(12, 2 * pairs.Count(p => Math.Abs(p.SeparationM.Length * 1e9 - 1) < 1e-9));
    }

    [Fact]
    public void Static_minimum_of_Lennard_Jones_fcc_has_the_textbook_distance_energy_and_bulk_modulus()
    {
        // With A12, A6: r0 = (2 A12 / A6)^(1/6) sigma = 1.09 sigma, E0 = -eps A6^2 / (2 A12) = -8.6 eps per atom,
        // B = 75 eps / sigma^3 (Kittel, ch. 3; the exact forms follow from u(r) = 2 eps [A12 (s/r)^12 - A6 (s/r)^6]
        // with v = r^3 / sqrt 2 per atom). Cutoff 8 sigma, no shift: the missing r^-6 tail is 2e-3 of A6.
        const double a12 = 12.13188, a6 = 14.45392;
        var r0 = Math.Pow(2 * a12 / a6, 1.0 / 6) * Sigma;
        var e0 = -Epsilon * a6 * a6 / (2 * a12);
        var u2 = 2 * Epsilon * PhysicalConstants.JoulePerEv * (156 * a12 * Math.Pow(Sigma / r0, 12) - 42 * a6 * Math.Pow(Sigma / r0, 6)) / Math.Pow(r0 * 1e-9, 2);
        var bulk = Math.Sqrt(2) / 9 * u2 / (r0 * 1e-9) / 1e9;

        var s = StaticLattice.Analyse(LjFcc(0.56, 8 * Sigma))!;
        var rNn = s.EquilibriumLatticeConstantNm / Math.Sqrt(2);
        Approx.Equal(1.09, rNn / Sigma, 5e-3, "r0 / sigma (Kittel's rounded value)");
        Approx.Equal(r0, rNn, 5e-4, "r0 from A12, A6");
        Approx.Equal(-8.6, s.EquilibriumEnergyEvPerAtom / Epsilon, 5e-3, "E0 / eps (Kittel)");
        Approx.Equal(e0, s.EquilibriumEnergyEvPerAtom, 3e-3, "E0 from A12, A6");
        Approx.Equal(75, s.EquilibriumBulkModulusGpa!.Value * 1e9 * Math.Pow(Sigma * 1e-9, 3) / (Epsilon * PhysicalConstants.JoulePerEv), 1e-2, "B sigma^3 / eps (Kittel)");
        Approx.Equal(bulk, s.EquilibriumBulkModulusGpa.Value, 1e-2, "B from A12, A6");
    }

    [Fact]
    public void At_the_static_minimum_the_long_waves_give_the_static_bulk_modulus_and_the_Cauchy_relation()
    {
        // Central pair forces on a Bravais lattice at zero stress: C12 = C44 (Cauchy; Born and Huang, ch. 3, from
        // memory) and (C11 + 2 C12)/3 = V d2E/dV2. The springs carry phi'' and phi'/r; both must be right for this.
        var given = LjFcc(0.56, 2.5 * Sigma, shift: true);
        var s = StaticLattice.Analyse(given)!;
        var relaxed = given.Scaled(s.EquilibriumScale);
        var c = LongWaveElasticity.Cubic(CompiledCrystal.From(relaxed))!;
        Approx.Equal(c.C44Gpa, c.C12Gpa, 1e-6, "C12 = C44");
        Approx.Equal(s.EquilibriumBulkModulusGpa!.Value, (c.C11Gpa + 2 * c.C12Gpa) / 3, 1e-6, "bulk modulus");
        Assert.True(Math.Abs(StaticLattice.Analyse(relaxed)!.PressureGpa!.Value) < 1e-9 * s.EquilibriumBulkModulusGpa.Value);

        // Away from the minimum the lattice is under pressure and the long waves see it through the phi'/r terms:
        // C12 != C44 (the wave moduli of a stressed crystal, not its zero-stress elastic constants).
        var squeezed = given.Scaled(s.EquilibriumScale * 0.98);
        var cs = LongWaveElasticity.Cubic(CompiledCrystal.From(squeezed))!;
        Assert.True(Math.Abs(cs.C12Gpa - cs.C44Gpa) > 1e-3 * cs.C11Gpa);
    }

    [Fact]
    public void Under_stress_the_long_waves_give_the_wave_moduli_of_the_lattice_sums()
    {
        // Long-wave limit of a Bravais lattice with central pairs, stress term included (Born and Huang, ch. 5,
        // from memory): rho v^2 = (1/2V) sum_R [(phi'' - phi'/r) (n.R)^2 (q.R)^2 / r^2 + (phi'/r) (q.R)^2] for
        // wave direction q and polarisation n. C11 and C44 are the [100] longitudinal and transverse moduli and
        // C12 follows from the [110] longitudinal one, (C11 + C12 + 2 C44)/2. The sums here run over the fcc
        // sites themselves, not the solver's pair list.
        foreach (var aNm in new[] { 0.53, 0.56 })
        {
            var c = LongWaveElasticity.Cubic(CompiledCrystal.From(LjFcc(aNm, 0.85)))!;
            double Sum(Func<Vec3, double> n, Func<Vec3, double> q)
            {
                var total = 0.0;
                for (var i = -6; i <= 6; i++)
                {
                    for (var j = -6; j <= 6; j++)
                    {
                        for (var k = -6; k <= 6; k++)
                        {
                            var r = new Vec3(i, j, k) * (aNm * 0.5e-9);
                            var d = r.Length;
                            if (((i + j + k) & 1) != 0 || d == 0 || d >= 0.85e-9)
                            {
                                continue;
                            }

                            var (s6, s12) = (Math.Pow(Sigma * 1e-9 / d, 6), Math.Pow(Sigma * 1e-9 / d, 12));
                            var eps = Epsilon * PhysicalConstants.JoulePerEv;
                            var d1 = 4 * eps * (-12 * s12 + 6 * s6) / d;
                            var d2 = 4 * eps * (156 * s12 - 42 * s6) / (d * d);
                            total += (d2 - d1 / d) * Math.Pow(n(r) * q(r), 2) / (d * d) + d1 / d * q(r) * q(r);
                        }
                    }
                }

                return total / (2 * Math.Pow(aNm * 1e-9, 3) / 4) / 1e9;
            }

            var c11 = Sum(r => r.X, r => r.X);
            var c44 = Sum(r => r.Y, r => r.X);
            var l110 = Sum(r => (r.X + r.Y) / Math.Sqrt(2), r => (r.X + r.Y) / Math.Sqrt(2));
            Approx.Equal(c11, c.C11Gpa, 1e-8, $"C11 at a = {aNm} nm");
            Approx.Equal(c44, c.C44Gpa, 1e-8, $"C44 at a = {aNm} nm");
            Approx.Equal(2 * l110 - c11 - 2 * c44, c.C12Gpa, 1e-8, $"C12 at a = {aNm} nm");
        }
    }

    [Fact]
    public void Static_pressure_is_minus_the_volume_derivative_of_the_energy()
    {
        // Finite difference of E(V) per cell against the reported pressure (common practice, no source).
        var model = LjFcc(0.52, 2.5 * Sigma, shift: true);
        var curve = new StaticEnergyCurve(model, StaticLattice.SmallestScale);
        const double h = 1e-5;
        var dE = curve.At(1 + h).Energy - curve.At(1 - h).Energy;
        var dV = curve.MeasureAt(1 + h) - curve.MeasureAt(1 - h);
        Approx.Equal(-dE / dV / 1e9, StaticLattice.Analyse(model)!.PressureGpa!.Value, 1e-6, "P = -dE/dV");
    }

    [Fact]
    public void Springs_are_the_second_derivatives_of_the_energy_of_displaced_atoms()
    {
        // A two-kind cell away from equilibrium (phi' != 0, so the transverse pre-stress term matters):
        // Buckingham between P and Q, Lennard-Jones within each kind. Phi(I0, J+R) = -K and Phi(I0, I0) = self
        // term, against central second differences of the lattice energy with one or two atoms displaced
        // (common practice, no source).
        var model = CrystalModel.Create(Lattice.FaceCentredCubic(0.58),
            [new Site("P", "P", Vec3.Zero, 23), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), 35)],
            potentials:
            [
                new PotentialTerm("P", "Q", new BuckinghamPotential(1500, 0.03, 0.002), 0.75),
                new PotentialTerm("P", "P", new LennardJonesPotential(0.01, 0.33), 0.75),
                new PotentialTerm("Q", "Q", new LennardJonesPotential(0.02, 0.36), 0.75),
            ]);
        var crystal = CompiledCrystal.From(model);
        var positions = model.Sites.Select(s => model.Lattice.ToCartesianM(s.Fractional)).ToArray();

        // Every atom within reach of the home cell, with its kind.
        var atoms = new List<(int Site, IntVec3 Cell, Vec3 X)>();
        for (var n1 = -4; n1 <= 4; n1++)
        {
            for (var n2 = -4; n2 <= 4; n2++)
            {
                for (var n3 = -4; n3 <= 4; n3++)
                {
                    for (var j = 0; j < 2; j++)
                    {
                        var cell = new IntVec3(n1, n2, n3);
                        atoms.Add((j, cell, model.Lattice.ToCartesianM(cell.AsVec3()) + positions[j]));
                    }
                }
            }
        }

        PotentialTerm Term(int a, int b) => model.Potentials.Single(t => (t.KindA == model.Sites[a].Kind && t.KindB == model.Sites[b].Kind) || (t.KindB == model.Sites[a].Kind && t.KindA == model.Sites[b].Kind));

        // Energy of the pairs that involve the displaced atoms (all others do not change).
        double Energy(Dictionary<int, Vec3> moved)
        {
            var e = 0.0;
            foreach (var (m, u) in moved)
            {
                for (var k = 0; k < atoms.Count; k++)
                {
                    if (k == m || (moved.ContainsKey(k) && k < m))
                    {
                        continue;
                    }

                    var xk = atoms[k].X + (moved.TryGetValue(k, out var uk) ? uk : Vec3.Zero);
                    var r = (xk - atoms[m].X - u).Length;
                    var term = Term(atoms[m].Site, atoms[k].Site);
                    if (r < term.CutoffNm * 1e-9)
                    {
                        e += term.Potential.EnergyJ(r);
                    }
                }
            }

            return e;
        }

        int Index(int site, IntVec3 cell) => atoms.FindIndex(a => a.Site == site && a.Cell == cell);
        const double h = 1e-14; // m
        Vec3 Axis(int a, double v) => a switch { 0 => new Vec3(v, 0, 0), 1 => new Vec3(0, v, 0), _ => new Vec3(0, 0, v) };
        double Second(int m, int a, int n, int b) =>
            (Energy(Move(m, Axis(a, h), n, Axis(b, h))) - Energy(Move(m, Axis(a, h), n, Axis(b, -h)))
             - Energy(Move(m, Axis(a, -h), n, Axis(b, h))) + Energy(Move(m, Axis(a, -h), n, Axis(b, -h)))) / (4 * h * h);
        static Dictionary<int, Vec3> Move(int m, Vec3 um, int n, Vec3 un)
        {
            var d = new Dictionary<int, Vec3> { [m] = um };
            d[n] = d.TryGetValue(n, out var existing) ? existing + un : un;
            return d;
        }

        var checkedBlocks = 0;
        foreach (var c in crystal.Couplings.Where(c => c.I == 0).Take(6))
        {
            var target = atoms.FindIndex(x => x.Site == c.J && (x.X - positions[0] - c.SeparationM).Length < 1e-15);
            for (var a = 0; a < 3; a++)
            {
                for (var b = 0; b < 3; b++)
                {
                    var numeric = Second(Index(0, IntVec3.Zero), a, target, b);
                    Approx.Equal(-c.SpringNPerM[a, b], numeric, 2e-4, $"Phi({a},{b}) to {c.J}", absolute: 2e-4 * Math.Abs(c.SpringNPerM.Trace));
                }
            }

            checkedBlocks++;
        }

        for (var a = 0; a < 3; a++)
        {
            var home = Index(1, IntVec3.Zero);
            Approx.Equal(crystal.SelfTerms[1][a, a], Second(home, a, home, a), 2e-4, $"self-term {a}{a}");
        }

        Assert.Equal(6, checkedBlocks);
        Assert.Contains(crystal.Couplings, c => Math.Abs(c.SpringNPerM.Xx - c.SpringNPerM.Yy) > 1e-6 && c.I != c.J);
    }

    [Fact]
    public void A_Morse_chain_at_its_minimum_has_the_spring_2_D_a_squared()
    {
        // phi''(r0) = 2 D a^2 for phi = D [(1 - e^{-a (r - r0)})^2 - 1] (Morse, Phys. Rev. 34, 57 (1929); from memory).
        // Cutoff between the first and second neighbours: the static minimum is at r0 and the chain's top
        // frequency is 2 sqrt(2 D a^2 / m).
        const double d = 0.3, width = 12.0, r0 = 0.28, m = 16;
        var chain = CrystalModel.Create(Lattice.Chain(0.3), [new Site("X", "X", Vec3.Zero, m)], degreesOfFreedom: DegreesOfFreedom.Scalar,
            potentials: [new PotentialTerm("X", "X", new MorsePotential(d, r0, width), 1.5 * r0, ShiftAtCutoff: false)]);
        var s = StaticLattice.Analyse(chain)!;
        Approx.Equal(r0, s.EquilibriumLatticeConstantNm, 1e-9, "static minimum");
        Approx.Equal(-d, s.EquilibriumEnergyEvPerAtom, 1e-12, "energy per atom at the minimum");
        var relaxed = chain.Scaled(s.EquilibriumScale);
        var k = 2 * d * PhysicalConstants.JoulePerEv * Math.Pow(width * 1e9, 2);
        Approx.Equal(k, CompiledCrystal.From(relaxed).Couplings[0].SpringNPerM.Xx, 1e-7, "2 D a^2");
        var result = PhononSolver.Solve(relaxed, FiniteSample.Create(64), new SolveOptions { TemperaturesK = [300] });
        Approx.Equal(2 * Math.Sqrt(k / (m * PhysicalConstants.AtomicMassKg)) / (2 * Math.PI) / 1e12, result.Summary.MaxFrequencyThz, 1e-9, "top frequency");
        Assert.Equal(r0, result.Summary.LatticeConstantNm!.Value, 9);
        Assert.NotNull(result.Summary.StaticLattice);
    }

    [Fact]
    public void The_energy_shift_makes_the_energy_continuous_where_a_shell_crosses_the_cutoff()
    {
        // Second shell of fcc at a: the cutoff a - 1e-9 nm lets it in just below s = 1; shifted, E jumps by nothing.
        const double a = 0.56;
        foreach (var shift in new[] { true, false })
        {
            var curve = new StaticEnergyCurve(LjFcc(a, a * (1 - 1e-6), shift), StaticLattice.SmallestScale);
            var jump = Math.Abs(curve.At(1 - 2e-6).Energy - curve.At(1).Energy);
            var size = Math.Abs(curve.At(1).Energy);
            Assert.True(shift ? jump < 1e-4 * size : jump > 1e-3 * size, $"shift = {shift}: jump {jump / size:G3} of E");
        }
    }

    [Fact]
    public void Potential_mistakes_are_reported_with_their_keys()
    {
        var negative = Assert.Throws<ModelException>(() => CrystalModel.Create(Lattice.FaceCentredCubic(0.5), [new Site("X", "X", Vec3.Zero, 40)],
            potentials: [new PotentialTerm("X", "X", new LennardJonesPotential(-0.01, 0.34), 0.9)]));
        Assert.Equal("potentials[0].well_depth_ev", negative.Problems.Single().Where);

        var shortCutoff = InteractionChecks.Find(LjFcc(0.56, 0.3)).Single();
        Assert.Equal("potentials[0].cutoff_nm", shortCutoff.Where);
        Assert.Contains("0.395980", shortCutoff.Message.Replace("0.39598 ", "0.395980 ", StringComparison.Ordinal), StringComparison.Ordinal);

        // Born-Mayer repulsion without dispersion: no well, the energy keeps falling as the lattice expands.
        var repulsive = CrystalModel.Create(Lattice.FaceCentredCubic(0.56), [new Site("X", "X", Vec3.Zero, 40)],
            potentials: [new PotentialTerm("X", "X", new BuckinghamPotential(1000, 0.03, 0), 0.9)]);
        var none = InteractionChecks.Find(repulsive).Single();
        Assert.Equal("potentials", none.Where);
        Assert.Contains("keeps falling as the lattice expands", none.Message, StringComparison.Ordinal);
        Assert.Throws<ModelException>(() => PhononSolver.Solve(repulsive, BulkSample.Uniform(3, 4), new SolveOptions()));
    }
}
