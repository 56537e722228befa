using System.Collections.Concurrent;
using System.Runtime.CompilerServices;
using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics.Simd;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Worker.Planning.Cost;

/// <summary>
/// A point's single-core run time estimated before it runs, from the work the solver will do, with
/// coefficients measured on this engine (calibration: bench/LatticeSweep.Bench, case "cost"; method
/// in DEVELOPERS.md, figures in bench/README.md). <c>check</c> sums and ranks it over every point and
/// the chunk planner sizes chunks with it. Cheap: a few multiplications per point.
/// </summary>
public static class PointCost
{
    /// <summary>Eigenvalues a finite crystal's pass 1 keeps for pass 2 (the Engine's fixed budget, FiniteCrystalSolver.StoredModeLimit).</summary>
    public const double StoredEigenvalues = 8_000_000;

    /// <summary>The work terms of one point, in the units the coefficients multiply.</summary>
    public sealed record Work(
        double FixedN3,
        double EigenSolves,
        double EigenSolvesN3,
        double VectorSolves,
        double VectorSolvesN3,
        double ModesStreamed,
        double SimplexWork,
        double TemperatureBins,
        double ConductivityFlops,
        double LongWaveVectorSolves = 0,
        double GaussianBins = 0,
        double GaussianChannelBins = 0,
        double FaceRuleRays = 0,
        double LongWaveSolvesN3 = 0)
    {
        public double[] AsArray() => [1.0, FixedN3, EigenSolves, EigenSolvesN3, VectorSolves, VectorSolvesN3, ModesStreamed, SimplexWork, TemperatureBins, ConductivityFlops, LongWaveVectorSolves, GaussianBins, GaussianChannelBins, FaceRuleRays, LongWaveSolvesN3];
    }

    /// <summary>
    /// Seconds per unit of each term, in the order of <see cref="Work.AsArray"/>: a fixed cost per
    /// point, and per point x n^3 (compiling the model, sound speeds, the floppy check: a few
    /// solves of its own); per eigen-solve (values only) and per solve x n^3; the same with eigenvectors; per mode
    /// streamed into a finite crystal's sums; per bulk mesh simplex x branch; per
    /// temperature x DOS bin; per conductivity flop-equivalent; per long-wave solve of a bulk point
    /// with eigenvectors (over its share as a solve; 0 since round 25, kept for a later fit). One table per width of the Engine's
    /// batched kernels (<see cref="KernelWidth.ActiveBits"/>), each measured by `bench/run.sh cost` at
    /// that width (non-negative least squares on the relative error of 26 solves' CPU time; figures and
    /// each case's estimate / measured in bench/README.md): the eigen-solver and D(q) run twice as
    /// many lanes per instruction at 512 bits, the tetrahedra and thermal sums do not.
    /// </summary>
    /// <remarks>
    /// Measured 2026-12-03 04:42 UTC, `LatticeSweep.Bench cost --repeats 5` on the AVX-512 machine (load average 12.4-11.8, so
    /// process CPU time), after the tetrahedra were counted per orbit of the axis permutations. The long-wave term (1.12e-5 then)
    /// was set to 0 on 2026-12-05 (bench/README, round 25): with the other terms as they are, every point it applies to was
    /// forecast long at both widths (1.6-2.1x for the 24^3 and 32^3 meshes with vectors), and its least-squares value is 0; the
    /// long waves are still counted among the solves with vectors. The other terms were not refitted: a refit of all of them
    /// on that day's runs made other points' forecasts worse. The last four terms (Gaussian broadening per mode x bin and per
    /// channel; a bulk point's face-rule rays and long-wave solves x n^3 beyond one default region) were fitted on 2026-12-05
    /// 13:05-13:28 UTC (`LatticeSweep.Bench cost --repeats 3`, two runs, load average 17-31, process CPU; the stack terms from the
    /// second run, whose 48-branch stack did not read 1.7 times the others') on the cases that have them, with every other
    /// coefficient kept, so no other case's forecast moved (bench/README.md, Round 26 (forecast)).
    /// </remarks>
    public static readonly double[] SecondsPerUnit512 =
    [
        4.51e-4,   // per point
        1.84e-8,   // per point x n^3
        0,         // per solve, values (absorbed by the n^3 term)
        4.37e-10,  // per solve x n^3, values
        8.94e-7,   // per solve, vectors
        2.33e-9,   // per solve x n^3, vectors
        5.63e-8,   // per mode streamed (finite)
        1.32e-7,   // per bulk mesh simplex x branch (3D: twice the cubes integrated)
        5.06e-8,   // per temperature x bin
        7.51e-10,  // per conductivity flop-equivalent
        0,         // per long-wave solve with eigenvectors (bulk), on top of its count among the solves (round 25: absorbed, see remarks)
        1.52e-8,   // per mode x bin of Gaussian broadening (bulk)
        7.6e-10,   // per mode x bin x channel of Gaussian broadening with channel weights (bulk)
        2.1e-5,    // per ray of the face rules a bulk point's long waves choose (choosing and using them, beyond the solves)
        6.6e-10,   // per long-wave solve x n^3 (bulk), on top of its count among the solves
    ];

    /// <summary>As <see cref="SecondsPerUnit512"/>, for 256-bit kernels (AVX2 without AVX-512), measured with <c>DOTNET_EnableAVX512=0</c>.</summary>
    /// <remarks>Measured 2026-12-03 04:42 UTC, `DOTNET_EnableAVX512=0 LatticeSweep.Bench cost --repeats 5` on the same machine, just after the 512-bit run (load average 11.8-11.2); the long-wave term set to 0 as in <see cref="SecondsPerUnit512"/>; the last four terms fitted as there, 2026-12-05 13:09-13:13 UTC with <c>DOTNET_EnableAVX512=0</c> (load average 23-29).</remarks>
    public static readonly double[] SecondsPerUnit256 =
    [
        4.49e-4,   // per point
        2.44e-8,   // per point x n^3
        0,         // per solve, values (absorbed by the n^3 term over n = 1 to 96)
        6.33e-10,  // per solve x n^3, values
        7.53e-7,   // per solve, vectors
        5.19e-9,   // per solve x n^3, vectors
        6.45e-8,   // per mode streamed (finite)
        1.31e-7,   // per bulk mesh simplex x branch (3D: twice the cubes integrated)
        7.42e-8,   // per temperature x bin
        7.76e-10,  // per conductivity flop-equivalent
        0,         // per long-wave solve with eigenvectors (bulk), on top of its count among the solves (round 25: absorbed, see remarks)
        1.51e-8,   // per mode x bin of Gaussian broadening (bulk)
        7.3e-10,   // per mode x bin x channel of Gaussian broadening with channel weights (bulk)
        2.3e-5,    // per ray of the face rules a bulk point's long waves choose (choosing and using them, beyond the solves)
        5.6e-10,   // per long-wave solve x n^3 (bulk), on top of its count among the solves
    ];

    /// <summary>
    /// The table for a kernel width in bits. The scalar path (no AVX2, or <c>LATSWEEP_SIMD_WIDTH=scalar</c>)
    /// was not calibrated: it takes the 256-bit table, so its forecasts run short.
    /// </summary>
    public static double[] SecondsPerUnitFor(int kernelBits) => kernelBits >= 512 ? SecondsPerUnit512 : SecondsPerUnit256;

    /// <summary>The table for the width this process's Engine uses (the machine that runs <c>check</c> is taken to be the one that runs the points).</summary>
    public static double[] SecondsPerUnit => SecondsPerUnitFor(KernelWidth.ActiveBits);

    /// <summary>Estimated single-core seconds for the point.</summary>
    public static double Seconds(CrystalModel model, Sample sample, SolveOptions options) => Seconds(WorkOf(model, sample, options));

    public static double Seconds(Work work) => Seconds(work, SecondsPerUnit);

    /// <summary>Estimated single-core seconds for the work with a given table (<see cref="SecondsPerUnitFor"/>).</summary>
    public static double Seconds(Work work, double[] secondsPerUnit)
    {
        ArgumentNullException.ThrowIfNull(work);
        ArgumentNullException.ThrowIfNull(secondsPerUnit);
        var x = work.AsArray();
        var s = 0.0;
        for (var i = 0; i < x.Length; i++)
        {
            s += x[i] * secondsPerUnit[i];
        }

        return s;
    }

    /// <summary>
    /// The work terms, following the solver's passes: a finite crystal solves the half set of its
    /// allowed wave vectors for eigenvalues, then again with eigenvectors when partial DOS or
    /// displacements need them (otherwise pass 2 reads pass 1's eigenvalues back while they fit the
    /// solver's 8e6-value budget) and streams every mode into its sums; a bulk mesh solves its half
    /// set once (with vectors when asked) and the long waves along rays near q = 0
    /// (<see cref="PhononSolver.LongWaveSolves"/>), and integrates tetrahedra over the fine DOS, one
    /// mesh cube per orbit of the axis permutations <see cref="ExpectedMeshSymmetry"/> expects.
    /// </summary>
    public static Work WorkOf(CrystalModel model, Sample sample, SolveOptions options)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(options);
        if (options.Expansion is { } expansion)
        {
            // The quasi-harmonic loop: the lattice as given with every option, and one lean harmonic solve
            // (eigenvalues, thermal sums) per volume; counted as if the given lattice were not one of them.
            var lean = options with { Expansion = null, PartialDos = false, MeanSquareDisplacement = false, Conductivity = null, Dispersion = null };
            var given = WorkOf(model, sample, options with { Expansion = null });
            var volume = WorkOf(model, sample, lean);
            return given with
            {
                FixedN3 = given.FixedN3 + expansion.VolumeCount * volume.FixedN3,
                EigenSolves = given.EigenSolves + expansion.VolumeCount * volume.EigenSolves,
                EigenSolvesN3 = given.EigenSolvesN3 + expansion.VolumeCount * volume.EigenSolvesN3,
                ModesStreamed = given.ModesStreamed + expansion.VolumeCount * volume.ModesStreamed,
                SimplexWork = given.SimplexWork + expansion.VolumeCount * volume.SimplexWork,
                TemperatureBins = given.TemperatureBins + expansion.VolumeCount * volume.TemperatureBins,
            };
        }

        var n = (double)model.BranchCount;
        var n3 = n * n * n;
        var vectors = options.PartialDos || options.MeanSquareDisplacement;
        var temperatures = options.TemperaturesK.Length + 1.0;
        var conductivity = ConductivityWork.EstimateFlops(model, sample, options) + AcousticFlopsOf(model, sample, options);
        switch (sample)
        {
            case FiniteSample f:
            {
                var half = (f.CellCount + 1) / 2.0;
                var secondPass = vectors || half * n > StoredEigenvalues;
                var values = half + (secondPass && !vectors ? half : 0);
                var withVectors = vectors ? half : 0;
                return new Work(n3, values, values * n3, withVectors, withVectors * n3, f.CellCount * n, 0, temperatures * options.DosBins, conductivity);
            }

            case BulkSample b:
            {
                // The mesh's half set, and the long-wave solves along rays near q = 0: the boxes' rays as the
                // solver's face rules choose them and the wider-box trials' probes (planned once per model and mesh).
                var plan = BulkPlanOf(model, b, options);
                var longWaves = (double)plan.LongWaveSolves;
                var half = ((b.PointCount + 1) / 2.0) + longWaves;
                var values = vectors ? 0 : half;
                var withVectors = vectors ? half : 0;
                var fineBins = Math.Max(2048.0, options.DosBins);

                // Simplices per mesh cell: intervals (1D), 2 triangles (2D), 6 tetrahedra (3D). In 3D the
                // tetrahedron sum integrates one cube per orbit of inversion and the axis permutations
                // the spectrum has; counted as whole-mesh tetrahedra (twice the cubes integrated: the
                // inversion pairing every 3D point has stays in the coefficient, as before), with the
                // permutations expected from the model and mesh by a conservative rule (not for Gaussian
                // broadening, which has no tetrahedra to save).
                var simplices = model.Lattice.Dimension switch { 1 => 1.0, 2 => 2.0, _ => 6.0 };
                var gaussian = options.DosMethod == DosMethod.Gaussian;
                var cells = gaussian ? 0
                    : model.Lattice.Dimension == 3 ? 2 * ExpectedMeshSymmetry.CubesIntegrated(model, b)
                    : b.PointCount;

                // Gaussian broadening has no tetrahedra: every mode of the whole mesh is spread over the bins
                // within 6 sigma of it (an erf per bin, and per channel with channel weights).
                var gaussianBins = gaussian ? b.PointCount * n * GaussianBinsPerMode(options, plan.HighestThz) : 0;

                // With eigenvectors the long waves cost more than mesh solves (their channel fractions,
                // one ray at a time): a term of their own, on top of their count among the solves.
                // The long waves' small steps are solved one matrix at a time, dearer per n^3 than the mesh's batches; each
                // face rule is chosen by trying candidates on the long-wave form (work that grows with the rays it ends at;
                // a panelled rule's refinement showed no cost beyond its rays in the fit), and each ray is fitted and deposited.
                // Counted beyond one region on the default rule (what the other terms were fitted with), so models whose
                // long waves take the default keep their forecast.
                var usual = PhononSolver.LongWaveSolves(model, b, options);
                var extraRays = Math.Max(0, plan.ChosenRays - (usual / PhononSolver.LongWaveSolvesPerRay));
                var extraSolves = Math.Max(0, longWaves - usual);
                var mesh = new Work(n3, values, values * n3, withVectors, withVectors * n3, 0, cells * n * simplices, temperatures * fineBins, conductivity, vectors ? longWaves : 0,
                    gaussianBins, vectors ? gaussianBins * n : 0, extraRays, extraSolves * n3);
                return WithMeshCheck(mesh, model, b, options);
            }

            case RealSpaceSample:
            {
                // Dense blocks and the kernel polynomial method: the Engine's own flop estimate, counted at
                // the measured rate of the conductivity's flop-equivalents (both are dense and sparse
                // linear algebra of the same kind), plus the fixed per-point work.
                var flops = PhononSolver.Estimate(model, sample, options).FlopEstimate;
                return new Work(n3, 0, 0, 0, 0, 0, 0, temperatures * options.DosBins, conductivity + flops);
            }

            default:
                throw new ArgumentException($"unknown sample type {sample.GetType().Name}", nameof(sample));
        }
    }

    /// <summary>
    /// The mesh check (<see cref="SolveOptions.MeshCheck"/>): the same bulk work on the half-density mesh
    /// without partial DOS or conductivity, added term by term (its fixed per-point work is the point's).
    /// </summary>
    private static Work WithMeshCheck(Work mesh, CrystalModel model, BulkSample sample, SolveOptions options)
    {
        if (!options.MeshCheck || PhononSolver.MeshCheckSample(sample, model.Lattice.Dimension) is not { } half)
        {
            return mesh;
        }

        var c = WorkOf(model, half, options with { MeshCheck = false, PartialDos = false, Conductivity = null, Dispersion = null });
        return mesh with
        {
            EigenSolves = mesh.EigenSolves + c.EigenSolves,
            EigenSolvesN3 = mesh.EigenSolvesN3 + c.EigenSolvesN3,
            VectorSolves = mesh.VectorSolves + c.VectorSolves,
            VectorSolvesN3 = mesh.VectorSolvesN3 + c.VectorSolvesN3,
            SimplexWork = mesh.SimplexWork + c.SimplexWork,
            TemperatureBins = mesh.TemperatureBins + c.TemperatureBins,
            LongWaveVectorSolves = mesh.LongWaveVectorSolves + c.LongWaveVectorSolves,
            GaussianBins = mesh.GaussianBins + c.GaussianBins,
            GaussianChannelBins = mesh.GaussianChannelBins + c.GaussianChannelBins,
            FaceRuleRays = mesh.FaceRuleRays + c.FaceRuleRays,
            LongWaveSolvesN3 = mesh.LongWaveSolvesN3 + c.LongWaveSolvesN3,
        };
    }

    /// <summary>
    /// Fine-grid bins one mode's Gaussian covers: the grid (<c>dos_bins</c> times the fine bins per output bin, at least
    /// 2,048) spans the spectrum and 6 sigma beyond each end; a mode covers the bins within 6 sigma of it.
    /// </summary>
    internal static double GaussianBinsPerMode(SolveOptions options, double highestThz)
    {
        var fineBins = options.DosBins * Math.Max(1.0, Math.Ceiling(2048.0 / options.DosBins));
        var tails = 12 * options.GaussianSigmaThz;
        return Math.Min(fineBins, (fineBins * tails / (Math.Max(highestThz, 0) + tails)) + 2);
    }

    /// <summary>
    /// The conductivity's acoustic averages (<see cref="ConductivityWork.AcousticDirections"/>), which a finite or bulk point
    /// with conductivity sweeps once whatever its size: 10,880 directions for a layered stack, over a second of a 24-branch
    /// stack's CPU, which a finite stack's forecast (a few ms of modes) left out. Foreseen once per model object (the
    /// forecast solves the first two rules, 1,280 eigenvalue solves in 3D). Real-space samples are estimated by the
    /// Engine's own flop count and are not changed here.
    /// </summary>
    private static double AcousticFlopsOf(CrystalModel model, Sample sample, SolveOptions options) =>
        options.Conductivity is null || sample is not (FiniteSample or BulkSample) ? 0
        : ConductivityWork.AcousticFlops(model.BranchCount, AcousticDirections.GetValue(model, m => new StrongBox<int>(ConductivityWork.AcousticDirections(m))).Value);

    /// <summary>Directions of the acoustic averages foreseen per model object.</summary>
    private static readonly ConditionalWeakTable<CrystalModel, StrongBox<int>> AcousticDirections = new();

    /// <summary>Bulk plans (<see cref="PhononSolver.PlanBulkPoint"/>) kept per model object and mesh: a forecast meets one model at many points.</summary>
    private static readonly ConditionalWeakTable<CrystalModel, ConcurrentDictionary<(int, int, int, bool), BulkPointPlan>> Plans = new();

    /// <summary>The bulk point's plan, made once per model object, mesh and DOS method.</summary>
    internal static BulkPointPlan BulkPlanOf(CrystalModel model, BulkSample sample, SolveOptions options)
    {
        var byMesh = Plans.GetValue(model, _ => new());
        var gaussian = options.DosMethod == DosMethod.Gaussian;
        return byMesh.GetOrAdd((sample.M1, sample.M2, sample.M3, gaussian), _ => PhononSolver.PlanBulkPoint(model, sample, options));
    }
}
