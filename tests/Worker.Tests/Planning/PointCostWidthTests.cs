using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics.Simd;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Planning.Cost;

namespace LatticeSweep.Worker.Tests.Planning;

/// <summary>The run-time forecast takes the coefficients of the kernel width this process's Engine uses.</summary>
public sealed class PointCostWidthTests
{
    private static readonly SolveOptions Plain = new() { TemperaturesK = [10, 100, 300], ReferenceTemperatureK = 300, PartialDos = false, MeanSquareDisplacement = false, ModeListMaxModes = 0 };

    [Fact]
    public void The_forecast_uses_the_table_of_the_width_in_force()
    {
        Assert.Contains(KernelWidth.ActiveBits, new[] { 512, 256, 64 });
        Assert.Same(PointCost.SecondsPerUnitFor(KernelWidth.ActiveBits), PointCost.SecondsPerUnit);
        var model = LayeredModelBuilder.Build(new LayeredModelSpec(LayeredHost.CubicStack, 0.3, 32, MassPattern.TwoBlocks(16, 28, 72), 40, 10));
        var work = PointCost.WorkOf(model, FiniteSample.Create(4, 4, 1), Plain);
        Assert.Equal(PointCost.Seconds(work, PointCost.SecondsPerUnit), PointCost.Seconds(model, FiniteSample.Create(4, 4, 1), Plain));
    }

    [Fact]
    public void Every_table_has_a_non_negative_coefficient_per_work_term_and_the_scalar_path_takes_the_256_bit_one()
    {
        var terms = new PointCost.Work(1, 1, 1, 1, 1, 1, 1, 1, 1, 1).AsArray().Length;
        foreach (var table in new[] { PointCost.SecondsPerUnit512, PointCost.SecondsPerUnit256 })
        {
            Assert.Equal(terms, table.Length);
            Assert.All(table, v => Assert.True(v >= 0 && double.IsFinite(v)));
        }

        Assert.Same(PointCost.SecondsPerUnit512, PointCost.SecondsPerUnitFor(512));
        Assert.Same(PointCost.SecondsPerUnit256, PointCost.SecondsPerUnitFor(256));
        Assert.Same(PointCost.SecondsPerUnit256, PointCost.SecondsPerUnitFor(64));
    }

    [Fact]
    public void A_point_bound_by_batched_eigen_solves_is_forecast_longer_at_256_bits_than_at_512()
    {
        // 24 branches (the batched solver's range is 3 to 48; above it one matrix at a time at any
        // width) on 24x24x6 cells: the eigenvalue solves dominate, and they run half as many lanes per
        // instruction at 256 bits (bench/README.md, "Calibrating the run-time estimate").
        Assert.True(PointCost.SecondsPerUnit256[3] > PointCost.SecondsPerUnit512[3]);
        var model = LayeredModelBuilder.Build(new LayeredModelSpec(LayeredHost.CubicStack, 0.3, 8, MassPattern.TwoBlocks(4, 28, 72), 40, 10));
        var work = PointCost.WorkOf(model, FiniteSample.Create(24, 24, 6), Plain);
        var at512 = PointCost.Seconds(work, PointCost.SecondsPerUnitFor(512));
        var at256 = PointCost.Seconds(work, PointCost.SecondsPerUnitFor(256));
        Assert.True(at256 > 1.1 * at512, $"256-bit {at256:G3} s against 512-bit {at512:G3} s");
    }
}
