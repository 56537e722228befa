using System.Collections.Immutable;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Solving;

public static partial class PhononSolver
{
    /// <summary>The check mesh needs at least this many points per periodic direction (a mesh of 4 is checked against 2).</summary>
    public const int MeshCheckMinCount = 2;

    /// <summary>
    /// The half-density mesh of a bulk point's mesh check, or null when it has fewer than
    /// <see cref="MeshCheckMinCount"/> points along a periodic direction.
    /// </summary>
    public static BulkSample? MeshCheckSample(BulkSample sample, int dimension)
    {
        ArgumentNullException.ThrowIfNull(sample);
        int[] half = [sample.M1 / 2, dimension >= 2 ? sample.M2 / 2 : 1, dimension >= 3 ? sample.M3 / 2 : 1];
        for (var a = 0; a < dimension; a++)
        {
            if (half[a] < MeshCheckMinCount)
            {
                return null;
            }
        }

        return BulkSample.Create(half[0], half[1], half[2]);
    }

    /// <summary>
    /// The same thermal sums on the half-density mesh (same integrator, same long-wave treatment planned
    /// for its own cells), and the difference of each number. Only the numbers the thermal tables carry are
    /// recomputed: no partial DOS, dispersion or conductivity on the check mesh. Null where the main point
    /// is unstable or the mesh is too small to halve.
    /// </summary>
    private static MeshChange? CheckMesh(
        CrystalModel model, CompiledCrystal crystal, ModeSolver solver, BulkSample sample, SolveOptions options,
        double[] temperatures, PointResult main, List<SoundSpeed> speeds, bool[]? zeroPointDivergent, CancellationToken ct)
    {
        if (!options.MeshCheck || !main.Summary.Stable || MeshCheckSample(sample, model.Lattice.Dimension) is not { } half)
        {
            return null;
        }

        var lean = options with { PartialDos = false, Dispersion = null, Conductivity = null, Expansion = null };
        var channelMasses = Enumerable.Range(0, crystal.Size).Select(c => crystal.MassesKg[c / crystal.Components]).ToArray();
        var sink = new ModeSink(temperatures, crystal.Size, channelMasses, options.MeanSquareDisplacement);

        // The tests read the main mesh's axis-permutation order after a solve: the check mesh keeps it.
        var order = BulkSolver.LastAxisPermutationOrderOnThisThread;
        SpectrumOutcome outcome;
        try
        {
            outcome = BulkSolver.Solve(solver, half, lean, sink, ct, checkMesh: true);
        }
        finally
        {
            BulkSolver.LastAxisPermutationOrderOnThisThread = order;
        }

        var coarse = Assemble(model, crystal, lean, temperatures, outcome, speeds, [], zeroPointDivergent);
        if (!coarse.Summary.Stable || coarse.Thermal.Length != main.Thermal.Length)
        {
            return null;
        }

        return MeshChanges.Between(main, coarse, [half.M1, half.M2, half.M3]);
    }
}
