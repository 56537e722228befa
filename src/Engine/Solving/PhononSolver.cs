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
    /// a box of its own makes twice as many (Dos/LongWaveRegions; known only after the mesh solve, so
    /// not counted here: 2 % of a 12 x 12 sheet point's time, bench/README.md, Round 11 (branch-box)).
    /// </summary>
    public static int LongWaveSolves(CrystalModel model, BulkSample sample, SolveOptions options)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(options);
        return options.DosMethod == DosMethod.Gaussian ? 0 : Dos.LongWaveRegion.SolveCount(model.Lattice.Dimension);
    }

    /// <summary>One harmonic solve (the options' expansion, if any, is not looked at).</summary>
    internal static PointResult SolveHarmonic(CrystalModel model, Sample sample, SolveOptions options, CancellationToken cancellationToken)
        => SolveCore(model, sample, options with { Expansion = null }, cancellationToken);
}
