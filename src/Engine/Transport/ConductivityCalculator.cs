using System.Collections.Immutable;
using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Kinetic theory in the relaxation-time approximation, kappa_aa = (1/V) sum_{q, branch} C v_a^2 tau,
/// over the exact Born-von Karman modes of a finite crystal or a Gamma-centred bulk mesh (V = cells
/// x volume per cell). Its own pass over the wave vectors (group velocities need eigenvectors, which
/// the thermal pass does not), single-threaded like the rest of a point.
/// </summary>
internal static class ConductivityCalculator
{
    /// <summary>Eigenvalues below -1e-8 of the largest mark an unstable model (the engine's criterion).</summary>
    private const double InstabilityRatio = 1e-8;

    public static ConductivityResult Compute(CrystalModel model, CompiledCrystal crystal, Sample sample, SolveOptions options, CancellationToken ct)
    {
        var settings = options.Conductivity ?? throw new ArgumentException("conductivity options are missing", nameof(options));
        ConductivityOptionsValidation.Check(model, sample, settings);
        var lattice = model.Lattice;
        var d = lattice.Dimension;
        var solver = new ModeSolver(new DynamicalMatrix(crystal));
        var acoustic = AcousticAverages.Measure(solver);
        var inputs = ConductivityInputs.Resolve(model, sample, settings, acoustic);

        var temperatures = options.TemperaturesK.Contains(options.ReferenceTemperatureK)
            ? options.TemperaturesK.ToArray()
            : [.. options.TemperaturesK, options.ReferenceTemperatureK];
        var reference = Array.IndexOf(temperatures, options.ReferenceTemperatureK);
        var bulk = sample is BulkSample;
        var mesh = MeshOf(sample);

        var sum = new KineticSum(temperatures, reference, d, inputs.Rates, settings.MeanFreePathTable);
        var faceRule = bulk ? GammaCellIntegrator.FaceRuleFor(solver.Matrix.Crystal, mesh, temperatures, inputs.Rates) : null;
        var (wanted, close) = acoustic.Stable && faceRule is not null ? LongWaveHandover.Needs(solver, lattice, mesh, temperatures) : (new bool[temperatures.Length], new bool[temperatures.Length]);
        var handover = acoustic.Stable && faceRule is not null ? LongWaveHandover.Plan(solver, lattice, mesh, temperatures, wanted) : null;

        // A sheet's zero valleys away from q = 0 (bulk meshes; Dos/ZeroValleys): their cells integrated like q = 0's.
        var valleys = acoustic.Stable && faceRule is not null ? ZeroValleys.Find(solver) : [];
        var untreated = 0;
        var stable = acoustic.Stable && Pass(solver, mesh, faceRule, handover, valleys, sum, ref untreated, ct);
        var scale = 1.0 / (Cells(mesh) * inputs.VolumePerCellM3);

        // Bulk meshes: the same sum on the mesh of half the density per direction, with the same treatment
        // of the long waves (the q = 0 cell's face rule, the hand-over at the same temperatures), so the
        // change measures the mesh, not a change of method. It is what the last doubling moved kappa by;
        // while the sum converges steadily it is larger than the error left at the full mesh.
        ImmutableArray<int> halfMesh = [];
        KineticSum? coarse = null;
        if (stable && bulk && settings.CheckMeshConvergence)
        {
            int[] half = [mesh[0] / 2, d >= 2 ? mesh[1] / 2 : 1, d >= 3 ? mesh[2] / 2 : 1];
            coarse = new KineticSum(temperatures, reference, d, inputs.Rates, meanFreePaths: false);
            stable &= Pass(solver, half, faceRule, handover?.OnCoarserMesh(half), valleys, coarse, ref untreated, ct);
            halfMesh = [.. half];
        }

        var coarseScale = halfMesh.IsEmpty ? 0 : 1.0 / (Cells([.. halfMesh]) * inputs.VolumePerCellM3);

        // An unequal mesh of a model with the lattice's rotation: each permuted component is the mean over the mesh and its rotations.
        var averaged = stable && bulk ? RotatedMeshAverage.Axes(lattice, mesh, solver) : 0;
        double Component(int t, int a) => a < averaged ? Enumerable.Range(0, averaged).Average(b => sum.Kappa(t, b)) : sum.Kappa(t, a);
        ConductivityRow Row(int t)
        {
            double Axis(int a) => !stable ? double.NaN : a >= d ? double.NaN : Component(t, a) * scale;
            var kappa = stable ? sum.MeanKappa(t) * scale : double.NaN;
            var change = coarse is null ? double.NaN : RelativeChange(kappa, coarse.MeanKappa(t) * coarseScale);

            // Where the carriers sit near q = 0 and this mesh uses no window for them, both meshes sample them
            // with one point per cell and can make the same error: the change is then a lower bound.
            // A zero valley left to the mesh points (off the mesh's points and cell corners, or too close to q = 0) is missed
            // alike on both meshes: the change is no bound there, so it is flagged as a lower bound too.
            // Where the hand-over's rays from q = 0 take the whole zone, they cross a valley with a polynomial along each ray,
            // alike on both meshes (1-2.5 % off at 5-10 K on the square sheet of Round 28): flagged likewise.
            var valleyAlike = valleys.Count > 0 && (untreated > 0 || (handover?.WholeZone[t] ?? false));
            var lowerBound = !double.IsNaN(change) && ((close[t] && !(handover?.On[t] ?? false)) || valleyAlike);
            return new ConductivityRow(temperatures[t], Axis(0), Axis(1), Axis(2), kappa, change, lowerBound);
        }

        var rows = ImmutableArray.CreateRange(Enumerable.Range(0, options.TemperaturesK.Length).Select(Row));
        var atReference = Row(reference);
        var (kappaMin, kappaMinLimit) = MinimumEstimate(model, acoustic, options.ReferenceTemperatureK);
        var (slackAtTheta, slackAtReference) = Slack(model, settings, acoustic, options.ReferenceTemperatureK);
        var finiteReference = double.IsFinite(atReference.KappaWPerMK) && atReference.KappaWPerMK > 0;

        return new ConductivityResult
        {
            ByTemperature = rows,
            ReferenceTemperatureK = options.ReferenceTemperatureK,
            AtReference = atReference,
            Stable = stable,
            SampleKind = bulk ? "bulk" : "finite",
            Mesh = [.. mesh],
            ConvergenceMesh = halfMesh,
            MeshRelativeChange = atReference.MeshRelativeChange,
            KappaMinWPerMK = kappaMin,
            KappaMinHighTemperatureWPerMK = kappaMinLimit,
            SlackKappaAtDebyeTemperatureWPerMK = slackAtTheta,
            SlackKappaAtReferenceWPerMK = slackAtReference,
            SharesAtReference = stable ? sum.Shares() : ScatteringShares.Undefined,
            AcousticDebyeTemperatureK = acoustic.AcousticDebyeTemperatureK,
            DebyeAverageSoundSpeedMPerS = acoustic.DebyeSpeedMPerS,
            MeanSoundSpeedsMPerS = acoustic.MeanSpeedsMPerS,
            BoundaryLengthNm = inputs.BoundaryLengthNm,
            MassVarianceGamma = inputs.MassVarianceGamma,
            UmklappDebyeTemperatureK = inputs.UmklappThetaK,
            UmklappSoundSpeedMPerS = inputs.UmklappSpeedMPerS,
            VolumePerCellM3 = inputs.VolumePerCellM3,
            CumulativeByMeanFreePath = stable && finiteReference && sum.MeanFreePaths is { } histogram ? histogram.Rows(scale) : [],
        };
    }

    /// <summary>
    /// One pass over the wave vectors (half of them: omega, |v_a| and C are the same at q and -q).
    /// Finite crystals: the q = 0 rigid translations are not heat carriers and add nothing; the
    /// other q = 0 branches count like any mode. Bulk meshes: the q = 0 point is replaced by the
    /// average over its cell (<see cref="GammaCellIntegrator"/>), and at temperatures whose thermal waves
    /// reach just past that cell, the cells around it hand over smoothly to the mesh
    /// (<see cref="LongWaveHandover"/>; in 3D along rays, <see cref="HandoverRays"/>). Returns false for an unstable model.
    /// </summary>
    /// <param name="faceRule">the q = 0 cell's face rule (bulk meshes; null for a finite crystal).</param>
    /// <param name="handover">the hand-over planned for this mesh, or null.</param>
    /// <param name="valleys">a sheet's zero valleys away from q = 0 (<see cref="ZeroValleys.Find"/>; empty for a finite crystal).</param>
    /// <param name="untreated">raised by the valleys this mesh leaves to its points (<see cref="ZeroValleyCells.Untreated"/>).</param>
    private static bool Pass(ModeSolver solver, int[] mesh, CellFaceRule? faceRule, LongWaveHandover? handover, IReadOnlyList<(Vec3 Reduced, int Branches)> valleys, KineticSum sum, ref int untreated, CancellationToken ct)
    {
        var n = solver.Size;
        var lattice = solver.Matrix.Crystal.Lattice;
        var rigid = solver.Matrix.Crystal.Components;
        var group = new GroupVelocities(solver);
        var velocities = new double[n * 3];
        var squares = new double[n * 3];
        var grid = new PeriodicGrid(mesh[0], mesh[1], mesh[2]);
        var gammaCell = faceRule is not null ? new GammaCellIntegrator(lattice, mesh, faceRule) : null;
        var weights = new double[sum.TemperaturesK.Length];
        var inPlane = handover is not null && gammaCell!.SymmetrisesInPlane(group, solver);
        var handoverRays = handover is not null && (lattice.Dimension == 3 || handover.AnyWholeZone) ? HandoverRays.For(handover, solver.Matrix.Crystal, mesh, sum.TemperaturesK, sum.Scattering) : null;
        var nodesUsed = handover?.UsesWindow ?? false;
        var rotations = DegenerateRotations.For(lattice);

        // A finite crystal's degenerate sets are exact and its allowed q are all there is: each set counts in the trace form.
        // A bulk mesh point stands for its cell, where the set splits and each branch carries its own velocity: the trace
        // there would count the set's inner elements on a line or plane of measure zero (docs/conductivity.md).
        var traceForm = faceRule is null;
        var stable = true;
        double lowest = 0, highest = 0;
        var valleyCells = valleys.Count > 0 ? ZeroValleyCells.For(solver, valleys, mesh, handover) : null;
        untreated = Math.Max(untreated, valleyCells?.Untreated ?? 0);
        if (valleyCells is { Any: true })
        {
            // Where the hand-over's rays take the whole zone, no mesh point counts, and neither do the valleys' cells.
            var valleysInPlane = gammaCell!.SymmetrisesInPlane(group, solver);
            stable &= valleyCells.Integrate(sum, valleysInPlane, t => handover is not null && handover.WholeZone[t] ? 0 : 1, ct);
        }

        // Solves q and adds its modes counted weight times, or weight x share(t) at each temperature t.
        void AddPoint(Vec3 q, int skip, double weight, Func<int, double>? share, bool node = false)
        {
            group.Solve(q, rotations[0], velocities, squares);
            var values = solver.Values;
            highest = Math.Max(highest, values[n - 1]);
            for (var k = skip; k < n; k++)
            {
                lowest = Math.Min(lowest, values[k]);
            }

            var degenerate = HasDegenerateSet(values, skip);
            var directions = degenerate ? rotations.Length : 1;
            if (share is not null)
            {
                for (var t = 0; t < weights.Length; t++)
                {
                    weights[t] = weight * share(t) / directions;
                }
            }

            for (var r = 0; r < directions; r++)
            {
                if (r > 0)
                {
                    group.Solve(q, rotations[r], velocities, squares);
                }

                for (var k = skip; k < n; k++)
                {
                    var v = new Vec3(velocities[k * 3], velocities[k * 3 + 1], velocities[k * 3 + 2]);
                    var omega = Math.Sqrt(Math.Max(values[k], 0));
                    if (traceForm && degenerate && group.IsDegenerate(k))
                    {
                        // A degenerate set counts in the trace form (GroupVelocities' squares, the same in any basis); each
                        // branch's own speed, read along this direction of u0's orbit, still sets its relaxation time, so the
                        // orbit average stays for tau that depends on |v|.
                        var s2 = new Vec3(squares[k * 3], squares[k * 3 + 1], squares[k * 3 + 2]);
                        if (node && inPlane)
                        {
                            v = GammaCellIntegrator.InPlaneAverage(v);
                            s2 = new Vec3((s2.X + s2.Y) / 2, (s2.X + s2.Y) / 2, s2.Z);
                        }

                        if (share is null)
                        {
                            sum.Add(omega, v, s2, weight / directions);
                        }
                        else
                        {
                            sum.Add(omega, v, s2, weights);
                        }

                        continue;
                    }

                    if (node && inPlane)
                    {
                        v = GammaCellIntegrator.InPlaneAverage(v);
                    }

                    if (share is null)
                    {
                        sum.Add(omega, v, weight / directions);
                    }
                    else
                    {
                        sum.Add(omega, v, weights);
                    }
                }
            }
        }

        foreach (var point in grid.HalfSet())
        {
            ct.ThrowIfCancellationRequested();
            if (point.IsGamma && gammaCell is not null)
            {
                stable &= gammaCell.Integrate(group, solver, sum, ct);
                handoverRays?.Integrate(group, solver, sum, inPlane, ct);
                continue;
            }

            var q = lattice.ToCartesianQ(point.Reduced);
            var skip = point.IsGamma ? rigid : valleyCells?.BranchesAt(point.Reduced, mesh) ?? 0;
            if (handover is null || (!handover.Touches(q) && !handover.AnyWholeZone))
            {
                AddPoint(q, skip, point.Weight, share: null);
                continue;
            }

            // Near q = 0, at the hand-over's temperatures the point samples f (1 - w) and its cell's nodes
            // integrate f w; at the others the point counts as before and the nodes not at all. Where the rays
            // integrate the whole zone (3D, carriers thinner than a spacing), no point counts.
            var rest = handover.Touches(q) ? 1 - handover.Window(handover.Distance(q)) : 1;
            AddPoint(q, skip, point.Weight, t => handover.WholeZone[t] ? 0 : handover.On[t] ? rest : 1);
            if (!handover.Touches(q))
            {
                continue;
            }

            if (lattice.Dimension == 3 || !nodesUsed)
            {
                continue; // 3D: the rays hold f w; 1D and 2D where every window temperature takes the whole zone's rays
            }

            foreach (var (node, nodeWeight) in handover.Nodes(point.Reduced))
            {
                var window = handover.Window(handover.Distance(node));
                if (window > 0)
                {
                    AddPoint(node, 0, point.Weight * nodeWeight, t => handover.On[t] && !handover.WholeZone[t] ? window : 0, node: true);
                }
            }
        }

        return stable && lowest >= -InstabilityRatio * highest;
    }

    /// <summary>The degeneracy test of <see cref="GroupVelocities"/>: neighbouring frequencies within 1e-6 of the largest.</summary>
    private static bool HasDegenerateSet(double[] values, int skip)
    {
        var n = values.Length;
        var tolerance = 1e-6 * Math.Sqrt(Math.Max(Math.Abs(values[n - 1]), Math.Abs(values[0])));
        for (var k = skip; k + 1 < n; k++)
        {
            if (Math.Abs(Math.Sqrt(Math.Abs(values[k + 1])) - Math.Sqrt(Math.Abs(values[k]))) <= tolerance)
            {
                return true;
            }
        }

        return false;
    }

    private static double Cells(int[] mesh) => (double)mesh[0] * mesh[1] * mesh[2];

    private static int[] MeshOf(Sample sample) => sample switch
    {
        FiniteSample f => [f.N1, f.N2, f.N3],
        BulkSample b => [b.M1, b.M2, b.M3],
        _ => throw new ArgumentException($"unknown sample type {sample.GetType().Name}", nameof(sample)),
    };

    private static double RelativeChange(double kappa, double coarse)
    {
        if (!double.IsFinite(kappa) || !double.IsFinite(coarse))
        {
            return double.NaN;
        }

        return kappa == 0 ? (coarse == 0 ? 0 : double.PositiveInfinity) : Math.Abs(kappa - coarse) / Math.Abs(kappa);
    }

    /// <summary>Cahill-Pohl-Watson at T and its high-T limit, from the direction-averaged branch speeds; 3D only.</summary>
    private static (double AtT, double Limit) MinimumEstimate(CrystalModel model, AcousticAverages acoustic, double temperatureK)
    {
        if (model.Lattice.Dimension != 3 || !acoustic.Stable)
        {
            return (double.NaN, double.NaN);
        }

        var atomsPerM3 = model.Sites.Length / model.Lattice.CellMeasure;
        return (MinimumConductivity.WPerMK(acoustic.MeanSpeedsMPerS, atomsPerM3, temperatureK),
            MinimumConductivity.HighTemperatureLimitWPerMK(acoustic.MeanSpeedsMPerS, atomsPerM3));
    }

    /// <summary>Slack's estimate at T = theta_a and at the reference temperature; 3D with a Grueneisen parameter only.</summary>
    private static (double AtTheta, double AtReference) Slack(CrystalModel model, ConductivityOptions settings, AcousticAverages acoustic, double temperatureK)
    {
        if (model.Lattice.Dimension != 3 || settings.GrueneisenParameter is not { } gamma || !acoustic.Stable)
        {
            return (double.NaN, double.NaN);
        }

        var r = model.Sites.Length;
        var theta = acoustic.AcousticDebyeTemperatureK;
        double At(double t) => SlackEstimate.WPerMK(model.CellMassAmu / r, model.Lattice.CellMeasure / r, r, theta, gamma, t);
        return (At(theta), temperatureK > 0 ? At(temperatureK) : double.NaN);
    }
}
