using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>Which finite points will list no modes, decided before solving and agreeing with what the solve lists.</summary>
public sealed class ModeListGapTests
{
    private static readonly SolveOptions Options = new() { TemperaturesK = [300], ModeListMaxModes = 500 };

    [Fact]
    public void A_crystal_within_the_limit_lists_its_modes_and_one_above_it_says_why_not()
    {
        var model = Crystals.FccCentral();
        var small = FiniteSample.Create(4, 4, 4);    // 192 modes
        var large = FiniteSample.Create(6, 6, 6);    // 648 modes
        Assert.Null(PhononSolver.ModeListGap(model, small, Options));
        Assert.NotEmpty(PhononSolver.Solve(model, small, Options).Modes);

        var gap = PhononSolver.ModeListGap(model, large, Options);
        Assert.Equal("648 modes, more than output.mode_list_max_modes = 500", gap);
        Assert.Empty(PhononSolver.Solve(model, large, Options).Modes);
        Assert.Equal("output.mode_list_max_modes = 0", PhononSolver.ModeListGap(model, small, Options with { ModeListMaxModes = 0 }));
    }

    [Fact]
    public void Free_and_disordered_blocks_follow_the_method_and_the_limit_per_configuration()
    {
        var model = Crystals.ScalarChain();
        var free = RealSpaceSample.Box(300, 1, 1, Boundary.Free);
        Assert.Null(PhononSolver.ModeListGap(model, free, Options));
        Assert.NotEmpty(PhononSolver.Solve(model, free, Options).Modes);

        var kpm = free with { Method = RealSpaceMethod.KernelPolynomial };
        Assert.Equal("solved by the kernel polynomial method, which resolves no single modes", PhononSolver.ModeListGap(model, kpm, Options));
        Assert.Empty(PhononSolver.Solve(model, kpm, Options).Modes);

        var disordered = RealSpaceSample.Box(600, 1, 1) with
        {
            Disorder = new Disorder([new SiteSubstitution("A", 10.0, 0.1, 1.0)], 2, Seed: 1),
        };
        Assert.Equal("600 modes, more than output.mode_list_max_modes = 500 in each configuration", PhononSolver.ModeListGap(model, disordered, Options));
        Assert.Empty(PhononSolver.Solve(model, disordered, Options).Modes);
        var listed = PhononSolver.Solve(model, disordered, Options with { ModeListMaxModes = 600 });
        Assert.Equal(1200, listed.Modes.Sum(m => m.Multiplicity));
    }

    [Fact]
    public void A_bulk_mesh_is_not_asked_about()
    {
        Assert.Null(PhononSolver.ModeListGap(Crystals.FccCentral(), BulkSample.Create(8, 8, 8), Options));
    }
}
