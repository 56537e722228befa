using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;

namespace LatticeSweep.Engine.Solving;

public static partial class PhononSolver
{
    private static PointResult SolveCore(CrystalModel model, Sample sample, SolveOptions options, CancellationToken cancellationToken)
        => throw new NotImplementedException();

    private static WorkEstimate EstimateCore(CrystalModel model, Sample sample, SolveOptions options)
        => throw new NotImplementedException();
}
