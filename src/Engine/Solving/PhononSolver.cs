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

    /// <summary>Solves one model. Throws <see cref="Errors.ModelException"/> for a model that cannot be solved.</summary>
    public static PointResult Solve(CrystalModel model, Sample sample, SolveOptions options, CancellationToken cancellationToken = default)
        => SolveCore(model, sample, options, cancellationToken);

    /// <summary>
    /// A cheap estimate of the work (number of eigen-solves times the cube of the matrix size, a
    /// relative unit) and of the peak working memory, made before starting.
    /// </summary>
    public static WorkEstimate Estimate(CrystalModel model, Sample sample, SolveOptions options)
        => EstimateCore(model, sample, options);
}
