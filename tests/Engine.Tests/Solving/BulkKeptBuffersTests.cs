using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Solving;

/// <summary>
/// A bulk point keeps its mesh's frequency and channel-weight arrays for the next point on the same
/// thread. Points of different models solved in turn on one thread must give the same bits as each
/// solved alone on a fresh thread: nothing of one point may reach the next. Invented demo models;
/// the reference is the same solve without any kept array (common practice, no source).
/// </summary>
public sealed class BulkKeptBuffersTests
{
    private static readonly SolveOptions Defaults = new()
    {
        TemperaturesK = [5, 20, 50, 100, 300, 1000], PartialDos = true, MeanSquareDisplacement = true, DosBins = 120,
    };

    [Fact]
    public void Points_solved_in_turn_on_one_thread_give_the_bits_of_fresh_solves()
    {
        // Same mesh and branch count, so the second point takes the first one's arrays: a cubic
        // rock-salt-like model (reduced by the axis permutations) and a strained one (the full sum).
        var cubic = Crystals.RockSalt();
        var strained = Strained();
        var sample = BulkSample.Create(8, 8, 8);

        var cubicFresh = SolveOnFreshThread(cubic, sample, Defaults);
        var strainedFresh = SolveOnFreshThread(strained, sample, Defaults);
        var eigenvaluesOnly = Defaults with { PartialDos = false, MeanSquareDisplacement = false };
        var cubicWithoutWeightsFresh = SolveOnFreshThread(cubic, sample, eigenvaluesOnly);

        var inTurn = new List<(PointResult Got, PointResult Fresh)>();
        for (var round = 0; round < 2; round++)
        {
            inTurn.Add((PhononSolver.Solve(strained, sample, Defaults), strainedFresh));
            inTurn.Add((PhononSolver.Solve(cubic, sample, Defaults), cubicFresh));
            inTurn.Add((PhononSolver.Solve(cubic, sample, eigenvaluesOnly), cubicWithoutWeightsFresh));
        }

        foreach (var (got, fresh) in inTurn)
        {
            AssertSameBits(fresh, got);
        }

        // The two models really differ, so a leak of one into the other would show.
        Assert.NotEqual(cubicFresh.Dos.Total.ToArray(), strainedFresh.Dos.Total.ToArray());
    }

    private static CrystalModel Strained()
    {
        var a = 0.56;
        var lattice = Lattice.Explicit([new Vec3(0, 0.5 * a, 0.51 * a), new Vec3(0.5 * a, 0, 0.51 * a), new Vec3(0.5 * a, 0.52 * a, 0)]);
        return CrystalModel.Create(
            lattice,
            [new Site("P", "P", Vec3.Zero, 23.0), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), 35.0)],
            [new ShellSpring("P", "Q", 1, 15.0, 3.0), new ShellSpring("P", "Q", 2, 12.0, 2.0), new ShellSpring("P", "P", 1, 3.0), new ShellSpring("Q", "Q", 1, 3.0)]);
    }

    private static PointResult SolveOnFreshThread(CrystalModel model, BulkSample sample, SolveOptions options)
    {
        PointResult? result = null;
        Exception? failure = null;
        var thread = new Thread(() =>
        {
            try
            {
                result = PhononSolver.Solve(model, sample, options);
            }
            catch (Exception e)
            {
                failure = e;
            }
        });
        thread.Start();
        thread.Join();
        Assert.Null(failure);
        return result!;
    }

    private static void AssertSameBits(PointResult expected, PointResult actual)
    {
        Assert.Equal(expected.Dos.FrequencyThz.ToArray(), actual.Dos.FrequencyThz.ToArray());
        Assert.Equal(expected.Dos.Total.ToArray(), actual.Dos.Total.ToArray());
        Assert.Equal(expected.Dos.PartialBySite.Length, actual.Dos.PartialBySite.Length);
        for (var s = 0; s < expected.Dos.PartialBySite.Length; s++)
        {
            Assert.Equal(expected.Dos.PartialBySite[s].ToArray(), actual.Dos.PartialBySite[s].ToArray());
        }

        Assert.Equal(expected.Thermal.ToArray(), actual.Thermal.ToArray());
        Assert.Equal(expected.Displacements.ToArray(), actual.Displacements.ToArray());
        Assert.Equal(expected.Summary with { Gaps = [], SoundSpeeds = [] }, actual.Summary with { Gaps = [], SoundSpeeds = [] });
        Assert.Equal(expected.Summary.Gaps.ToArray(), actual.Summary.Gaps.ToArray());
        Assert.Equal(expected.Summary.SoundSpeeds.Length, actual.Summary.SoundSpeeds.Length);
        for (var d = 0; d < expected.Summary.SoundSpeeds.Length; d++)
        {
            var (e, a) = (expected.Summary.SoundSpeeds[d], actual.Summary.SoundSpeeds[d]);
            Assert.Equal(e.Mean, a.Mean);
            Assert.Equal(e.SpeedsMPerS.ToArray(), a.SpeedsMPerS.ToArray());
        }
    }
}
