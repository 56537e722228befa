using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// The one entry point for solving a model: spectrum, density of states, thermal functions and the
/// summary. Single-threaded by design: the worker pool is the parallel layer.
/// </summary>
public static partial class PhononSolver
{
    /// <summary>Engine version written next to every result.</summary>
    public static string EngineVersion =>
        typeof(PhononSolver).Assembly.GetName().Version?.ToString(3) ?? "0.0.0";

    /// <summary>
    /// Solves one model. Throws <see cref="Errors.ModelException"/> for a model that cannot be solved.
    /// With <see cref="SolveOptions.Expansion"/> the quasi-harmonic loop runs one harmonic solve per
    /// volume around it (QuasiHarmonic/); the harmonic solve itself knows nothing of it.
    /// </summary>
    public static PointResult Solve(CrystalModel model, Sample sample, SolveOptions options, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(options);
        return options.Expansion is null
            ? SolveCore(model, sample, options, cancellationToken)
            : QuasiHarmonic.QuasiHarmonicLoop.Solve(model, sample, options, cancellationToken);
    }

    /// <summary>
    /// A cheap estimate of the work (number of eigen-solves times the cube of the matrix size, a
    /// relative unit) and of the peak working memory, made before starting.
    /// </summary>
    public static WorkEstimate Estimate(CrystalModel model, Sample sample, SolveOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        var one = EstimateCore(model, sample, options);
        if (options.Expansion is not { } expansion)
        {
            return one;
        }

        var solves = QuasiHarmonic.QuasiHarmonicLoop.SolveCount(expansion);
        return one with { EigenSolves = one.EigenSolves * solves, FlopEstimate = one.FlopEstimate * solves };
    }

    /// <summary>
    /// Eigen-solves a bulk point makes beside its mesh for the acoustic branches near q = 0 (the
    /// model's own long waves along rays; none with Gaussian broadening): a fixed number per point,
    /// which for a large basis on a coarse mesh is most of the work. A sheet whose flexural branch keeps
    /// a box of its own makes a second set (Dos/LongWaveRegions). Whether it does is known only after
    /// the mesh solve (the in-plane cones must reach the lowest optical branch inside the box), so a sheet
    /// that can have one (out-of-plane motion and more than one site: a flexural branch and an optical
    /// floor) is counted with both sets: where it keeps one box (the stiff honeycomb of the tests from
    /// 16 x 16 on) the count is one set too many (bench/README.md, Round 12 (trust-signals)). A 3D cell is
    /// counted with one set: one whose slower cones keep a box of their own makes two or three (6 of the 294
    /// 3D cell x mesh rows of docs/outside-checks.md Round 17), and one whose every cone ended in one narrowed
    /// box tries one to three more sets for its slower cones, with five solves per ray to test each (51 of the
    /// 294 rows, Round 18); both are known only after the mesh solve, so the estimate leaves them out.
    /// </summary>
    public static int LongWaveSolves(CrystalModel model, BulkSample sample, SolveOptions options)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(options);
        if (options.DosMethod == DosMethod.Gaussian)
        {
            return 0;
        }

        var d = model.Lattice.Dimension;
        var sets = d == 2 && model.ComponentsPerSite == 3 && model.Sites.Length > 1 ? 2 : 1;
        return sets * Dos.LongWaveRegion.SolveCount(d);
    }

    /// <summary>One harmonic solve (the options' expansion, if any, is not looked at).</summary>
    internal static PointResult SolveHarmonic(CrystalModel model, Sample sample, SolveOptions options, CancellationToken cancellationToken)
        => SolveCore(model, sample, options with { Expansion = null }, cancellationToken);
}
