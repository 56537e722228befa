using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.Json.Serialization;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics.Simd;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Engine.Tests.Determinism;

/// <summary>
/// What <see cref="SameBitsTests"/> runs in a child process (this test assembly's own entry point,
/// <see cref="ProbeProgram"/>) under each JIT setting: the vector sine and cosine of a fixed set of
/// angles, and a few small solves that cover the batched paths (a bulk mesh with tetrahedra, long
/// waves, partial DOS and displacements, a dispersion path; a finite crystal's exact mode sums; a long
/// chain; conductivity), every number written in its shortest round-trip form, so equal text is equal bits.
/// </summary>
internal static class SameBitsProbe
{
    public const string Argument = "same-bits-probe";

    private static readonly JsonSerializerOptions Json = new()
    {
        NumberHandling = JsonNumberHandling.AllowNamedFloatingPointLiterals,
        WriteIndented = true,
    };

    public static void Write(TextWriter output)
    {
        output.WriteLine($"width {SimdWidths.Active}");
        WriteSinCos(output);

        // The bench's 20 ms point that showed it (bench/queue/20ms-points.toml, point 4): a two-site fcc
        // mesh with partial DOS and displacements, and the long waves around q = 0.
        var rockSalt = CrystalModel.Create(
            Lattice.FaceCentredCubic(0.56),
            [new Site("P", "P", Vec3.Zero, 23.0), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), 35.0)],
            [new ShellSpring("P", "Q", 1, 15.0, 2.05351170569), new ShellSpring("P", "P", 1, 3.0), new ShellSpring("Q", "Q", 1, 3.0)]);
        var path = new DispersionPath([new PathCorner("G", Vec3.Zero), new PathCorner("X", new Vec3(0.5, 0, 0.5)), new PathCorner("L", new Vec3(0.5, 0.5, 0.5))], 6);
        WriteSolve(output, "rock-salt bulk 14^3", rockSalt, BulkSample.Create(14, 14, 14), new SolveOptions { Dispersion = path });
        WriteSolve(output, "rock-salt finite 5^3", Crystals.RockSalt(), FiniteSample.Create(5, 5, 5), new SolveOptions());
        WriteSolve(output, "diatomic chain 20000", Crystals.DiatomicChain(20, 37), FiniteSample.Create(20_000), new SolveOptions());
        WriteSolve(output, "fcc bulk 8^3 with conductivity", Crystals.FccCentral(), BulkSample.Create(8, 8, 8),
            new SolveOptions { Conductivity = new ConductivityOptions { Constant = new ConstantScattering(1.0) } });
    }

    private static void WriteSinCos(TextWriter output)
    {
        // Angles as D(q) makes them: a block within pi/4 (wave vectors near q = 0, where a vector of
        // small angles alone takes a polynomial of its own), then tens of radians mixed with far ones,
        // from a fixed generator; the odd length leaves a few for the last, partial vector.
        var angles = new double[4099];
        var state = 0x9E3779B97F4A7C15UL;
        for (var k = 0; k < angles.Length; k++)
        {
            state = (state * 6364136223846793005UL) + 1442695040888963407UL;
            var unit = (state >> 11) * (1.0 / (1UL << 53));
            angles[k] = (unit - 0.5) * (k < 2048 ? 1.6 : k % 3 == 0 ? 200.0 : k % 3 == 1 ? 7.0 : 2e6);
        }

        var sines = new double[angles.Length];
        var cosines = new double[angles.Length];
        VectorSinCos.Compute(angles, sines, cosines);
        var line = new StringBuilder("sincos");
        for (var k = 0; k < angles.Length; k++)
        {
            line.Append(' ').Append(sines[k].ToString("R", CultureInfo.InvariantCulture))
                .Append(' ').Append(cosines[k].ToString("R", CultureInfo.InvariantCulture));
        }

        output.WriteLine(line);
    }

    private static void WriteSolve(TextWriter output, string name, CrystalModel model, Sample sample, SolveOptions options)
    {
        var result = PhononSolver.Solve(model, sample, options);
        output.WriteLine($"solve {name}");
        output.WriteLine(JsonSerializer.Serialize(result, Json));
    }
}
