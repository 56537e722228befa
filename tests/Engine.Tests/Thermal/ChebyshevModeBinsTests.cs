using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Thermal;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Tests.Thermal;

/// <summary>
/// The binned mode sum must equal the plain one (every mode at every temperature) to 1e-9 relative:
/// the reference here is the same <see cref="ModeSink"/> without bins, fed the same modes.
/// </summary>
public sealed class ChebyshevModeBinsTests
{
    private const double Contract = 1e-9;

    // From far below the thermal range of the top modes to far above it: x_top runs from ~500 to ~0.05.
    private static readonly double[] Temperatures = [0, 0.5, 2, 5, 20, 77, 300, 1000, 5000];

    [Fact]
    public void Binned_sums_match_the_plain_sum_for_a_chain_like_spectrum_down_to_the_zero_threshold()
    {
        // Modes of an N-cell chain, 2 w0 |sin(pi n / N)|, plus a cluster just above the 1e-7 zero
        // threshold and a few exactly at the top: the bins' edges, both ranges and the floor are all hit.
        const int cells = 200_001;
        var omegaTop = 2 * Crystals.Omega0();
        var modes = new List<(double Omega, double Weight)>();
        for (var k = 1; k < cells; k++)
        {
            modes.Add((omegaTop * Math.Abs(Math.Sin(Math.PI * k / cells)), 1.0 / cells));
        }

        for (var k = 1; k <= 50; k++)
        {
            modes.Add((omegaTop * 1.1e-7 * k, 1e-6));
        }

        modes.Add((omegaTop, 1e-3));
        AssertBinnedEqualsPlain(modes, omegaTop, channels: 0);
    }

    [Fact]
    public void Binned_displacements_match_the_plain_sum_with_channel_fractions()
    {
        // Three channels with fractions that vary smoothly and abruptly with frequency.
        var random = new Random(7);
        var omegaTop = 3e13;
        var modes = new List<(double Omega, double Weight)>();
        for (var k = 0; k < 200_000; k++)
        {
            modes.Add((omegaTop * Math.Pow(random.NextDouble(), 0.5), 1e-4));
        }

        AssertBinnedEqualsPlain(modes, omegaTop, channels: 3);
    }

    [Fact]
    public void Finite_crystal_thermal_rows_match_the_plain_mode_sum_over_the_same_eigenvalues()
    {
        // End to end through the solver (which bins), against a plain sum over the same eigenvalues.
        var model = Crystals.RockSalt();
        var options = new SolveOptions { TemperaturesK = [.. Temperatures.Where(t => t > 0)], PartialDos = false, MeanSquareDisplacement = false };
        var result = PhononSolver.Solve(model, FiniteSample.Create(16, 16, 16), options);

        var crystal = CompiledCrystal.From(model);
        var solver = new ModeSolver(new DynamicalMatrix(crystal));
        var grid = new PeriodicGrid(16, 16, 16);
        var plain = new ModeSink([.. options.TemperaturesK], crystal.Size, new double[crystal.Size], displacements: false);
        var lambdaMax = 0.0;
        foreach (var p in grid.HalfSet())
        {
            solver.SolveValues(model.Lattice.ToCartesianQ(p.Reduced));
            lambdaMax = Math.Max(lambdaMax, solver.Values[^1]);
        }

        foreach (var p in grid.HalfSet())
        {
            solver.SolveValues(model.Lattice.ToCartesianQ(p.Reduced));
            for (var k = p.IsGamma ? 3 : 0; k < crystal.Size; k++)
            {
                if (solver.Values[k] > 1e-14 * lambdaMax)
                {
                    plain.Add(Math.Sqrt(solver.Values[k]), p.Weight / (double)grid.Count, default);
                }
            }
        }

        var perMol = PhysicalConstants.AvogadroPerMol / 2;
        for (var t = 0; t < options.TemperaturesK.Length; t++)
        {
            var s = plain.Sums(t);
            var row = result.Thermal[t];
            Tolerance.AssertClose(s.Internal * perMol, row.InternalEnergyJPerMol, Contract, 0, $"U at {row.TemperatureK} K");
            Tolerance.AssertClose(s.Entropy * perMol, row.EntropyJPerMolK, Contract, 0, $"S at {row.TemperatureK} K");
            Tolerance.AssertClose(s.HeatCapacity * perMol, row.HeatCapacityJPerMolK, Contract, 0, $"Cv at {row.TemperatureK} K");
            Tolerance.AssertClose(s.Free * perMol, row.FreeEnergyJPerMol, Contract, 0, $"F at {row.TemperatureK} K");
        }
    }

    [Fact]
    public void Modes_added_many_at_once_give_the_one_by_one_sums_to_round_off()
    {
        // A chain's modes in wave-vector order (long runs in one bin, four at a time where the width
        // allows), then modes in the logarithmic bins, below the floor (summed directly) and one
        // batch holding a zero weight (the one-by-one fallback); batch sizes that split runs and fours.
        const int cells = 300_001;
        var omegaTop = 2 * Crystals.Omega0();
        var modes = new List<(double Omega, double Weight)>();
        for (var k = cells / 2; k >= 1; k--)
        {
            modes.Add((omegaTop * Math.Abs(Math.Sin(Math.PI * k / cells)), 2.0 / cells));
        }

        for (var k = 1; k <= 50; k++)
        {
            modes.Add((omegaTop * 1.1e-7 * k, 1e-6));
            modes.Add((omegaTop * 1e-11 * k, 1e-6));
        }

        modes.Add((omegaTop * 0.5, 0.0));
        var masses = new[] { 30 * PhysicalConstants.AtomicMassKg };
        var one = new ModeSink(Temperatures, 1, masses, displacements: false);
        var many = new ModeSink(Temperatures, 1, masses, displacements: false);
        one.PrepareBins(omegaTop, modes.Count);
        many.PrepareBins(omegaTop, modes.Count);
        Assert.True(many.IsBinning);
        foreach (var (omega, weight) in modes)
        {
            one.Add(omega, weight, default);
        }

        var omegas = modes.Select(m => m.Omega).ToArray();
        var weights = modes.Select(m => m.Weight).ToArray();
        for (var first = 0; first < omegas.Length; first += 1_003)
        {
            var count = Math.Min(1_003, omegas.Length - first);
            many.AddMany(omegas.AsSpan(first, count), weights.AsSpan(first, count));
        }

        Assert.Equal(one.StatesCounted, many.StatesCounted); // summed in the same order
        for (var t = 0; t < Temperatures.Length; t++)
        {
            var a = one.Sums(t);
            var b = many.Sums(t);
            var at = $"T = {Temperatures[t]} K";
            Tolerance.AssertClose(a.ZeroPoint, b.ZeroPoint, 1e-13, 0, $"zero point, {at}");
            Tolerance.AssertClose(a.Internal, b.Internal, 1e-13, 0, $"U, {at}");
            Tolerance.AssertClose(a.Entropy, b.Entropy, 1e-12, 1e-300, $"S, {at}");
            Tolerance.AssertClose(a.HeatCapacity, b.HeatCapacity, 1e-12, 1e-300, $"Cv, {at}");
            Tolerance.AssertClose(a.Free, b.Free, 1e-13, 0, $"F, {at}");
        }

        Tolerance.AssertClose(one.SumLnOmega, many.SumLnOmega, 1e-13, 0, "sum of ln omega");
        Tolerance.AssertClose(one.SumOmegaSquared, many.SumOmegaSquared, 1e-13, 0, "sum of omega^2");
        Tolerance.AssertClose(one.SumInverseOmegaSquared, many.SumInverseOmegaSquared, 1e-13, 0, "sum of omega^-2");
    }

    [Fact]
    public void Few_modes_are_summed_one_by_one()
    {
        // Binning pays only when the modes outnumber the bins' quadrature points.
        Assert.Null(ChebyshevModeBins.TryCreate(1e13, [300.0], expectedModes: 100, channels: 0));
        Assert.NotNull(ChebyshevModeBins.TryCreate(1e13, [300.0], expectedModes: 10_000_000, channels: 0));
    }

    private static void AssertBinnedEqualsPlain(List<(double Omega, double Weight)> modes, double omegaTop, int channels)
    {
        var masses = Enumerable.Repeat(30 * PhysicalConstants.AtomicMassKg, Math.Max(channels, 1)).ToArray();
        var plain = new ModeSink(Temperatures, Math.Max(channels, 1), masses, displacements: channels > 0);
        var binned = new ModeSink(Temperatures, Math.Max(channels, 1), masses, displacements: channels > 0);
        binned.PrepareBins(omegaTop, modes.Count);
        Assert.True(binned.IsBinning, "the case must exercise the bins, not the plain fallback");
        var fractions = new double[Math.Max(channels, 1)];
        foreach (var (omega, weight) in modes)
        {
            if (channels > 0)
            {
                var u = omega / omegaTop;
                fractions[0] = 0.5 * u * u;
                fractions[1] = u > 0.6 ? 0.7 : 0.1;
                fractions[2] = 1 - fractions[0] - fractions[1];
            }

            plain.Add(omega, weight, channels > 0 ? fractions : default);
            binned.Add(omega, weight, channels > 0 ? fractions : default);
        }

        for (var t = 0; t < Temperatures.Length; t++)
        {
            var p = plain.Sums(t);
            var b = binned.Sums(t);
            var at = $"T = {Temperatures[t]} K";
            Tolerance.AssertClose(p.ZeroPoint, b.ZeroPoint, Contract, 0, $"zero point, {at}");
            Tolerance.AssertClose(p.Internal, b.Internal, Contract, 0, $"U, {at}");
            Tolerance.AssertClose(p.Entropy, b.Entropy, Contract, 1e-300, $"S, {at}");
            Tolerance.AssertClose(p.HeatCapacity, b.HeatCapacity, Contract, 1e-300, $"Cv, {at}");

            // F = ZPE + kT sum ln(1 - e^-x) is accumulated as one number, so its thermal part cannot be
            // isolated below round-off of ZPE; the scale is ZPE + |F - ZPE|, as in the bench.
            Tolerance.AssertClose(p.Free, b.Free, 0, Contract * (p.ZeroPoint + Math.Abs(p.Free - p.ZeroPoint)), $"F, {at}");
            for (var c = 0; c < channels; c++)
            {
                Tolerance.AssertClose(plain.Msd(t, c), binned.Msd(t, c), Contract, 0, $"msd channel {c}, {at}");
            }
        }

        Tolerance.AssertClose(plain.StatesCounted, binned.StatesCounted, 1e-14, 0, "states");
        Tolerance.AssertClose(plain.SumInverseOmegaSquared, binned.SumInverseOmegaSquared, Contract, 0, "sum 1/w^2");
        Tolerance.AssertClose(plain.SumLnOmega, binned.SumLnOmega, Contract, 0, "sum ln w");
        Tolerance.AssertClose(plain.SumOmegaSquared, binned.SumOmegaSquared, Contract, 0, "sum w^2");
    }
}
