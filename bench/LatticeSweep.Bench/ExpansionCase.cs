using System.Diagnostics;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QuasiHarmonic;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;

namespace LatticeSweep.Bench;

/// <summary>
/// Case (f): one quasi-harmonic point (7 volumes) against the 7 harmonic solves it is made of, run
/// alone (ours against ours, no peer). The model is an invented two-site rock-salt-like crystal whose
/// springs come from potentials (Morse between the kinds, Lennard-Jones within each), relaxed to
/// its static minimum so the point's own solve is one of the volumes. The three sides are run in turn
/// (quasi-harmonic, the same 7 solves by hand, 7 full harmonic points) so machine load hits them alike.
/// </summary>
internal static class ExpansionCase
{
    public static Dictionary<string, object> Run(int mesh, int temperatures, int repeats)
    {
        var given = CrystalModel.Create(Lattice.FaceCentredCubic(0.58),
            [new Site("P", "P", Vec3.Zero, 23), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), 35)],
            potentials:
            [
                new PotentialTerm("P", "Q", new MorsePotential(0.3, 0.28, 12), 0.75),
                new PotentialTerm("P", "P", new LennardJonesPotential(0.01, 0.33), 0.75),
                new PotentialTerm("Q", "Q", new LennardJonesPotential(0.02, 0.36), 0.75),
            ]);
        var model = given.Scaled(StaticLattice.Analyse(given)!.EquilibriumScale);
        var sample = BulkSample.Uniform(3, mesh);
        var expansion = new ExpansionOptions { VolumeCount = 7 };
        var full = new SolveOptions
        {
            TemperaturesK = [.. Enumerable.Range(0, temperatures).Select(i => 5.0 + (595.0 * i / (temperatures - 1)))],
            ReferenceTemperatureK = 300,
        };
        var lean = full with { PartialDos = false, MeanSquareDisplacement = false, ModeListMaxModes = 0 };
        var scales = QuasiHarmonicLoop.Grid(1.0, expansion);
        var models = scales.Select(s => model.Scaled(s, scaleCutoffs: true)).ToArray();

        void QuasiHarmonic() => PhononSolver.Solve(model, sample, full with { Expansion = expansion });
        void SameSolves()
        {
            for (var k = 0; k < models.Length; k++)
            {
                PhononSolver.Solve(models[k], sample, Math.Abs(scales[k] - 1) < 1e-12 ? full : lean);
            }
        }

        void FullPoints()
        {
            foreach (var m in models)
            {
                PhononSolver.Solve(m, sample, full);
            }
        }

        var check = PhononSolver.Solve(model, sample, full with { Expansion = expansion });
        Action[] sides = [QuasiHarmonic, SameSolves, FullPoints];
        foreach (var side in sides)
        {
            side(); // warm-up
        }

        var wall = sides.Select(_ => new List<double>()).ToArray();
        var cpu = sides.Select(_ => new List<double>()).ToArray();
        for (var r = 0; r < repeats; r++)
        {
            for (var k = 0; k < sides.Length; k++)
            {
                GC.Collect();
                GC.WaitForPendingFinalizers();
                var cpu0 = Environment.CpuUsage.TotalTime;
                var sw = Stopwatch.StartNew();
                sides[k]();
                wall[k].Add(sw.Elapsed.TotalSeconds);
                cpu[k].Add((Environment.CpuUsage.TotalTime - cpu0).TotalSeconds);
            }
        }

        static double Median(List<double> x)
        {
            var s = x.Order().ToArray();
            return s.Length % 2 == 1 ? s[s.Length / 2] : 0.5 * (s[(s.Length / 2) - 1] + s[s.Length / 2]);
        }

        var reference = check.Expansion!.AtReference;
        var result = new Dictionary<string, object>
        {
            ["mesh"] = mesh,
            ["temperatures"] = temperatures,
            ["volumes"] = check.Expansion.ScalesSolved.Length,
            ["breakdown_at_reference"] = reference.Breakdown ?? "",
            ["linear_expansion_per_k_at_300k"] = reference.LinearExpansionPerK ?? double.NaN,
            ["quasi_harmonic_s"] = Median(wall[0]),
            ["same_7_solves_s"] = Median(wall[1]),
            ["seven_full_points_s"] = Median(wall[2]),
            ["quasi_harmonic_cpu_s"] = Median(cpu[0]),
            ["same_7_solves_cpu_s"] = Median(cpu[1]),
            ["seven_full_points_cpu_s"] = Median(cpu[2]),
        };
        Console.Error.WriteLine(FormattableString.Invariant(
            $"  expansion: quasi-harmonic {Median(wall[0]):F3} s, the same 7 solves {Median(wall[1]):F3} s ({Median(wall[0]) / Median(wall[1]) - 1:+0.0%;-0.0%}), 7 full points {Median(wall[2]):F3} s ({Median(wall[0]) / Median(wall[2]) - 1:+0.0%;-0.0%}); cpu {Median(cpu[0]):F3} / {Median(cpu[1]):F3} / {Median(cpu[2]):F3} s; {check.Expansion.ScalesSolved.Length} volumes, alpha_L(300 K) = {reference.LinearExpansionPerK:E3} /K"));
        return result;
    }
}
