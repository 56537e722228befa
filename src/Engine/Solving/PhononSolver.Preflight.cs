using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Engine.Solving;

/// <summary>What a model's pre-flight found besides refusals: a sign of a floppy model.</summary>
/// <param name="ZeroModeAtReducedQ">A wave vector away from q = 0 (on a plane or line through it) where some branch has zero frequency, or null.</param>
public sealed record ModelPreflight(int BranchCount, Vec3? ZeroModeAtReducedQ);

/// <summary>
/// The checks <see cref="Solve"/> makes before any spectrum, callable without solving. Three entry
/// points share one set of checks (the same helpers <see cref="Solve"/> itself raises from, so the
/// messages are the solver's own): <see cref="PreflightModel"/> once per distinct model,
/// <see cref="PreflightPoint"/> per point (both throw the first refusal as <see cref="Solve"/>
/// would), and <see cref="Preflight"/>, which collects every refusal of a point without throwing.
/// </summary>
public static partial class PhononSolver
{
    /// <summary>
    /// The checks <see cref="Solve"/> makes about the model before any spectrum, without the
    /// spectrum: it compiles the force constants (bends and potentials included), finds the static
    /// minimum of a model with potentials, and refuses a branch of zero frequency at a general
    /// wave vector (throws <see cref="ModelException"/> as <see cref="Solve"/> would). It also looks
    /// for zero-frequency branches on the planes and lines through q = 0, where a floppy model (say,
    /// central springs only on a simple cubic lattice) has modes the thermal sums leave out. A few
    /// eigen-solves of the model's size: meant to be called once per distinct model.
    /// </summary>
    public static ModelPreflight PreflightModel(CrystalModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        var solver = new ModeSolver(new DynamicalMatrix(CompiledCrystal.From(model)));
        ModelPropertiesStep.StaticLatticeOf(model);
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
        if (SizeProblem(model, sample, options) is { } tooLarge)
        {
            throw new ModelException([tooLarge]);
        }

        if (sample is RealSpaceSample r)
        {
            CheckRealSpaceSize(model, r, options);
        }

        if (options.Expansion is { } expansion)
        {
            QuasiHarmonic.QuasiHarmonicLoop.Validate(model, expansion);
        }

        if (sample is BulkSample bulk && options.DosMethod != DosMethod.Gaussian && CachedValleyProblem(model, bulk, options.Conductivity is not null) is { } valley)
        {
            throw new ModelException([valley]);
        }

        if (options.Conductivity is { } conductivity)
        {
            // With thermal expansion a missing Grueneisen parameter is computed, as Solve does.
            ConductivityOptionsValidation.Check(model, sample, options.Expansion is null ? conductivity : conductivity with { GrueneisenParameter = conductivity.GrueneisenParameter ?? 1.0 });
        }
    }

    /// <summary>
    /// Every <see cref="ModelProblem"/> that <see cref="PreflightModel"/> and <see cref="PreflightPoint"/>
    /// would raise for this point, collected instead of thrown (a user fixing a job file sees them
    /// all at once): bad options, a sample that does not fit the lattice, a crystal or mesh too large
    /// for the limits, force constants that cannot be built, a branch of zero frequency at a general
    /// wave vector, and bad conductivity settings. An empty list means a solve will start and run to
    /// a result; that result may still say the model is unstable or floppy (those are results, not
    /// errors). Cost: one build of the force constants and one eigen-solve of D(q).
    /// </summary>
    public static IReadOnlyList<ModelProblem> Preflight(CrystalModel model, Sample sample, SolveOptions options)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(options);
        var problems = OptionsValidation.Problems(options);
        Collect(problems, () => CheckSample(model, sample));
        if (SizeProblem(model, sample, options) is { } tooLarge)
        {
            problems.Add(tooLarge);
        }

        CompiledCrystal? crystal = null;
        Collect(problems, () => crystal = CompiledCrystal.From(model));
        if (crystal is not null && FloppyBranchProblem(new ModeSolver(new DynamicalMatrix(crystal))) is { } floppy)
        {
            problems.Add(floppy);
        }
        else if (crystal is not null && ValleyProblem(new ModeSolver(new DynamicalMatrix(crystal)), sample, options) is { } valley)
        {
            problems.Add(valley);
        }

        if (sample is RealSpaceSample r)
        {
            Collect(problems, () => CheckRealSpaceSize(model, r, options));
        }

        if (options.Expansion is { } expansion)
        {
            Collect(problems, () => QuasiHarmonic.QuasiHarmonicLoop.Validate(model, expansion));
        }

        if (options.Conductivity is { } conductivity)
        {
            // With thermal expansion a missing Grueneisen parameter is computed, as Solve does.
            Collect(problems, () => ConductivityOptionsValidation.Check(model, sample, options.Expansion is null ? conductivity : conductivity with { GrueneisenParameter = conductivity.GrueneisenParameter ?? 1.0 }));
        }

        return problems;
    }

    /// <summary>
    /// The refusal of a bulk point whose zero valleys away from q = 0 the solver would leave out (<see cref="ZeroValleys"/>):
    /// a sheet's or chain's valley that the mesh puts neither on a mesh point nor midway between two (naming <c>sample.mesh[k]</c>),
    /// any valley of a 3D crystal, or a chain's valley where the conductivity is asked for (naming <c>model</c>); null otherwise, and for Gaussian broadening, which has
    /// no long-wave rays for q = 0 either. <see cref="BulkSolver"/> raises the same.
    /// </summary>
    private static ModelProblem? ValleyProblem(ModeSolver solver, Sample sample, SolveOptions options)
    {
        if (sample is not BulkSample bulk || options.DosMethod == DosMethod.Gaussian)
        {
            return null;
        }

        lock (solver)
        {
            return ZeroValleys.BulkProblem(solver, ZeroValleys.ForBulkMesh(solver), bulk, options.Conductivity is not null);
        }
    }

    /// <summary>
    /// <see cref="ValleyProblem"/> once per model object and mesh: the forecast's points share a model object per distinct
    /// model, and a valley search costs 15 or more eigen-solves (0.3-0.7 ms a point in bench/README.md, Round 29 (valleys
    /// cost), where the rest of a point's pre-flight is about 1 ms).
    /// </summary>
    private static ModelProblem? CachedValleyProblem(CrystalModel model, BulkSample mesh, bool conductivity)
    {
        var entry = ValleyProblems.GetValue(model, m => new ValleyEntry(new ModeSolver(new DynamicalMatrix(CompiledCrystal.From(m)))));
        lock (entry)
        {
            var key = (mesh.M1, mesh.M2, mesh.M3, conductivity);
            if (!entry.ByMesh.TryGetValue(key, out var problem))
            {
                problem = ValleyProblem(entry.Solver, mesh, conductivity ? new SolveOptions { Conductivity = new Transport.ConductivityOptions() } : new SolveOptions());
                entry.ByMesh[key] = problem;
            }

            return problem;
        }
    }

    private sealed record ValleyEntry(ModeSolver Solver)
    {
        public Dictionary<(int, int, int, bool), ModelProblem?> ByMesh { get; } = [];
    }

    private static readonly System.Runtime.CompilerServices.ConditionalWeakTable<CrystalModel, ValleyEntry> ValleyProblems = new();

    /// <summary>The refusal of a sample too large for an exact sum (finite) or for the memory limit (bulk), or null.</summary>
    private static ModelProblem? SizeProblem(CrystalModel model, Sample sample, SolveOptions options) => sample switch
    {
        FiniteSample f => FiniteCrystalSolver.SizeProblem(f, model.BranchCount),
        BulkSample b => BulkSolver.MemoryProblem(b, model.BranchCount, options),
        _ => null,
    };

    private static void Collect(List<ModelProblem> problems, Action check)
    {
        try
        {
            check();
        }
        catch (ModelException e)
        {
            problems.AddRange(e.Problems);
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
