using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Engine.Solving;

/// <summary>What a model's pre-flight found besides refusals: a sign of a floppy model.</summary>
/// <param name="ZeroModeAtReducedQ">A wave vector away from q = 0 (on a plane or line through it) where some branch has zero frequency, or null.</param>
public sealed record ModelPreflight(int BranchCount, Vec3? ZeroModeAtReducedQ);

public static partial class PhononSolver
{
    /// <summary>
    /// The checks <see cref="Solve"/> makes about the model before any spectrum, without the
    /// spectrum: it compiles the force constants and refuses a branch of zero frequency at a general
    /// wave vector (throws <see cref="ModelException"/> as <see cref="Solve"/> would). It also looks
    /// for zero-frequency branches on the planes and lines through q = 0, where a floppy model (say,
    /// central springs only on a simple cubic lattice) has modes the thermal sums leave out. A few
    /// eigen-solves of the model's size: meant to be called once per distinct model.
    /// </summary>
    public static ModelPreflight PreflightModel(CrystalModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        var solver = new ModeSolver(new DynamicalMatrix(CompiledCrystal.From(model)));
        CheckNoFloppyBranch(solver);
        return new ModelPreflight(model.BranchCount, ZeroBranchThroughGamma(solver));
    }

    /// <summary>
    /// The checks <see cref="Solve"/> makes about one point before any spectrum, given a model that
    /// passed <see cref="PreflightModel"/>: the options, the sample against the lattice, the sample's
    /// size limits (modes of a finite crystal, memory of a bulk mesh) and the conductivity options
    /// against model and sample (e.g. an isotope composition whose mean mass is not the site's
    /// mass). Throws <see cref="ModelException"/> with what <see cref="Solve"/> would throw. Cheap.
    /// </summary>
    public static void PreflightPoint(CrystalModel model, Sample sample, SolveOptions options)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(options);
        OptionsValidation.Check(options);
        CheckSample(model, sample);
        var n = model.BranchCount;
        switch (sample)
        {
            case FiniteSample f when f.CellCount * (double)n > FiniteCrystalSolver.MaxModes:
                throw Guard.Single(ModelProblemKind.TooLarge, "sample.cells",
                    $"{f.CellCount} cells x {n} branches = {f.CellCount * (double)n:G4} modes is more than the {FiniteCrystalSolver.MaxModes} this engine accepts for an exact sum; use a bulk mesh or a smaller crystal");
            case RealSpaceSample r:
                CheckRealSpaceSize(model, r, options);
                break;
            case BulkSample b when BulkSolver.EstimateBytes(b.PointCount, n, options.PartialDos || options.MeanSquareDisplacement) > options.MemoryLimitBytes:
                throw Guard.Single(ModelProblemKind.TooLarge, "sample.mesh",
                    $"a {b.M1}x{b.M2}x{b.M3} mesh with {n} branches needs more than the {options.MemoryLimitBytes / (1 << 20)} MiB allowed; use a coarser mesh, or turn off partial DOS and displacements");
        }

        if (options.Conductivity is { } conductivity)
        {
            ConductivityOptionsValidation.Check(model, sample, conductivity);
        }
    }

    /// <summary>A reduced wave vector on a coordinate plane or axis through q = 0 where a branch has zero frequency.</summary>
    private static Vec3? ZeroBranchThroughGamma(ModeSolver solver)
    {
        var lattice = solver.Matrix.Crystal.Lattice;
        var d = lattice.Dimension;
        double[] generic = [0.2718281, 0.3141592, 0.1234567];
        for (var zeroed = 1; zeroed < (1 << d) - 1; zeroed++)
        {
            var c = new double[3];
            for (var k = 0; k < d; k++)
            {
                c[k] = (zeroed & (1 << k)) != 0 ? 0 : generic[k];
            }

            var reduced = new Vec3(c[0], c[1], c[2]);
            solver.SolveValues(lattice.ToCartesianQ(reduced));
            var values = solver.Values;
            var top = Math.Abs(values[^1]);
            if (top > 0 && Math.Abs(values[0]) <= 1e-10 * top)
            {
                return reduced;
            }
        }

        return null;
    }
}
