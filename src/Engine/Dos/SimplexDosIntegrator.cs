using System.Runtime.CompilerServices;

namespace LatticeSweep.Engine.Dos;

/// <summary>
/// Bulk density of states by linear interpolation of each branch inside simplices of a periodic
/// Gamma-centred mesh: intervals (1D), two triangles per mesh square (2D), six tetrahedra per mesh
/// cube sharing one main diagonal (3D). Each branch contributes one state per cell in all.
/// Partial (channel) densities use the mean of the corner weights of each simplex.
/// </summary>
internal static class SimplexDosIntegrator
{
    // Cube corners are numbered x + 2y + 4z; all six tetrahedra share the diagonal 0-7.
    private static readonly int[][] Tetrahedra =
    [
        [0, 1, 3, 7], [0, 1, 5, 7], [0, 2, 3, 7], [0, 2, 6, 7], [0, 4, 5, 7], [0, 4, 6, 7],
    ];

    private static readonly int[][] Triangles = [[0, 1, 3], [0, 2, 3]];

    /// <param name="mesh">Mesh counts (unused directions 1).</param>
    /// <param name="frequencyThz">Frequency at [point * branches + branch], point = (i1 * M2 + i2) * M3 + i3.</param>
    /// <param name="weights">Optional channel weights at [(point * branches + branch) * channels + c]; per mode they sum to 1.</param>
    /// <param name="total">Accumulates states per cell in each bin.</param>
    /// <param name="partial">Accumulates per channel, [c * bins + bin]; may be empty.</param>
    /// <param name="longWaves">Cells whose lowest branches are integrated elsewhere (<see cref="LongWaveRegion"/>); they skip those branches here.</param>
    /// <param name="moments">Per-bin moments of the states (1D and 2D only; the 3D path ignores them).</param>
    /// <param name="vectors">3D only: the 256-bit tetrahedron kernel (true), the scalar one (false), or the process default (null); same bits either way.</param>
    /// <param name="axisPermutations">3D only: permutations of the mesh axes that leave the frequencies unchanged (<see cref="MeshAxisPermutations.Find"/>); one cube per orbit is integrated, its channel weights the mean over the orbit's cubes (read where they are, so they need no symmetry of their own). Null: inversion alone.</param>
    public static void Accumulate(
        int dimension, (int M1, int M2, int M3) mesh, int branches, double[] frequencyThz,
        double[]? weights, int channels, FrequencyGrid grid, double[] total, double[] partial, LongWaveBox? longWaves = null, BinMoments? moments = null, bool? vectors = null,
        MeshAxisPermutations? axisPermutations = null)
    {
        var (m1, m2, m3) = mesh;
        var cells = (long)m1 * m2 * m3;
        if (dimension == 3)
        {
            AccumulateTetrahedra(mesh, branches, frequencyThz, weights, channels, grid, total, partial, longWaves, vectors ?? TetrahedronBins.VectorsByDefault, axisPermutations ?? MeshAxisPermutations.None);
            return;
        }

        var simplexShare = dimension switch { 1 => 1.0, 2 => 0.5, _ => 1.0 / 6.0 } / cells;
        var corners = new int[8];
        var e = new double[4];
        var order = new int[4];
        var meanWeight = new double[Math.Max(channels, 1)];

        // 2D: every branch's triangles the simplices take (the acoustic ones outside their long-wave box) lowered by their mean
        // interpolation error (TriangleCurvature); only where the box takes the cones' apex (the
        // difference stencil would cross q = 0 otherwise).
        var acousticBranches = longWaves is { } box ? Math.Min(box.Branches, branches) : 0;
        var curvedBranches = dimension == 2 && longWaves is not null && m1 >= 3 && m2 >= 3 ? branches : 0;
        var shifts = new double[2 * Math.Max(curvedBranches, 1)];
        var branchTops = new double[curvedBranches];
        var branchBottoms = new double[curvedBranches];
        for (var b = 0; b < curvedBranches; b++)
        {
            branchTops[b] = double.NegativeInfinity;
            branchBottoms[b] = double.PositiveInfinity;
            for (long p = 0; p < cells; p++)
            {
                branchTops[b] = Math.Max(branchTops[b], frequencyThz[(p * branches) + b]);
                branchBottoms[b] = Math.Min(branchBottoms[b], frequencyThz[(p * branches) + b]);
            }

            // An acoustic branch's floor is 0 (q = 0), whatever round-off the mesh value there carries.
            branchBottoms[b] = b < acousticBranches ? 0.0 : branchBottoms[b];
        }

        // 1D: every branch's intervals moved by their mean interpolation error (IntervalCurvature),
        // each held within its branch's range on the mesh.
        var chainCurved = dimension == 1 && m1 >= 3;
        var chainBottoms = new double[chainCurved ? branches : 0];
        var chainTops = new double[chainCurved ? branches : 0];
        var chainEnds = new double[2];
        for (var b = 0; b < chainBottoms.Length; b++)
        {
            (chainBottoms[b], chainTops[b]) = (double.PositiveInfinity, double.NegativeInfinity);
            for (var p = 0; p < m1; p++)
            {
                chainBottoms[b] = Math.Min(chainBottoms[b], frequencyThz[(p * branches) + b]);
                chainTops[b] = Math.Max(chainTops[b], frequencyThz[(p * branches) + b]);
            }
        }

        for (var i1 = 0; i1 < m1; i1++)
        {
            for (var i2 = 0; i2 < (dimension >= 2 ? m2 : 1); i2++)
            {
                for (var i3 = 0; i3 < (dimension >= 3 ? m3 : 1); i3++)
                {
                    for (var c = 0; c < 8; c++)
                    {
                        var j1 = (i1 + (c & 1)) % m1;
                        var j2 = (i2 + ((c >> 1) & 1)) % m2;
                        var j3 = (i3 + ((c >> 2) & 1)) % m3;
                        corners[c] = (j1 * m2 + j2) * m3 + j3;
                    }

                    var simplices = dimension switch { 1 => [[0, 1]], 2 => Triangles, _ => Tetrahedra };
                    var firstBranch = longWaves?.FirstSimplexBranch(i1, i2, i3, m1, m2, m3) ?? 0;
                    // Branches the simplices take here: lowered (a sheet's acoustic branches may have boxes of their own).
                    var curved = curvedBranches;
                    for (var b = firstBranch; b < curved; b++)
                    {
                        TriangleCurvature.SquareShifts(frequencyThz, branches, b, m1, m2, i1, i2, corners.AsSpan(0, 4), b < acousticBranches, branchBottoms[b], branchTops[b], shifts.AsSpan(2 * b, 2));
                    }

                    for (var s = 0; s < simplices.Length; s++)
                    {
                        var simplex = simplices[s];
                        for (var b = firstBranch; b < branches; b++)
                        {
                            var lift = b < curved ? shifts[(2 * b) + s] : 0.0;
                            if (chainCurved)
                            {
                                IntervalCurvature.Ends(frequencyThz, branches, b, m1, i1, chainBottoms[b], chainTops[b], chainEnds);
                            }

                            AddSimplex(simplex, corners, b, branches, frequencyThz, weights, channels, grid, simplexShare, total, partial, e, order, meanWeight, lift, chainCurved ? chainEnds : null);
                            if (moments is not null)
                            {
                                AddMoments(simplex.Length, e, simplexShare, grid, moments);
                            }
                        }
                    }
                }
            }
        }
    }

    // The six tetrahedra as flat corner lists (same split as Tetrahedra above).
    private static readonly int[] TetrahedronCorners = [0, 1, 3, 7, 0, 1, 5, 7, 0, 2, 3, 7, 0, 2, 6, 7, 0, 4, 5, 7, 0, 4, 6, 7];

    /// <summary>
    /// The 3D case in one tight loop: corner indices without modulo, a sorting network for the four
    /// corner values, and the cumulative fraction at successive bin edges from per-tetrahedron
    /// constants (no division per edge), the bins filled by <see cref="TetrahedronBins"/> into padded
    /// accumulators that are added to the caller's at the end. Same numbers as <see cref="AddSimplex"/>.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    private static void AccumulateTetrahedra(
        (int M1, int M2, int M3) mesh, int branches, double[] frequencyThz, double[]? weights, int channels,
        FrequencyGrid grid, double[] total, double[] partial, LongWaveBox? longWaves, bool vectors, MeshAxisPermutations axisPermutations)
    {
        var (m1, m2, m3) = mesh;
        var share = 1.0 / 6.0 / ((long)m1 * m2 * m3);
        Span<int> corners = stackalloc int[8];
        var meanWeight = new double[Math.Max(channels, 1)];
        var useWeights = weights is not null && channels > 0;
        var kernel = new TetrahedronBins(grid, vectors);
        vectors = kernel.UsesVectors;
        var stride = grid.Bins + TetrahedronBins.Padding;
        var paddedTotal = new double[stride];
        var paddedPartial = useWeights ? new double[channels * stride] : [];

        // omega(-q) = omega(q) (and the channel weights agree), and inversion maps the mesh cube based
        // at i onto the one based at -(i + 1), carrying the six-tetrahedra split onto itself. So a cube
        // and its image add the same states: visit one of each pair, twice the share. Axis permutations
        // that leave the frequencies unchanged map cubes and their splits onto each other likewise:
        // one cube per orbit, the orbit's count times the share. Channel weights are not assumed to
        // follow (a degenerate mode's split among channels is the eigen-solver's choice, and a site
        // map would have to be proven): each orbit tetrahedron's weights are read at its own corners
        // and averaged over the orbit, so the partial sums are the full sum's to round-off.
        // The vector kernel sets up a cube's tetrahedra four at a time (PrepareBatch), in the order
        // the loop below adds them: tetrahedron by tetrahedron, branch by branch.
        var batch = 6 * branches;
        var cornerA = new double[batch + 3];
        var cornerB = new double[batch + 3];
        var cornerC = new double[batch + 3];
        var cornerD = new double[batch + 3];
        int[][] inverted = [ImageOfCubes(m1), ImageOfCubes(m2), ImageOfCubes(m3)];
        var operations = axisPermutations.Permutations;
        Span<int> cubeBase = stackalloc int[3];
        Span<int> orbit = stackalloc int[2 * operations.Count];

        // With channel weights and permutations: the mesh points at the corners of one cube per class
        // {g C, -g C} of the orbit (8 per class), and the number of distinct cubes in each class.
        // Curvature shifts (TetrahedronCurvature) of every branch's six tetrahedra, [6 * branch + t] (optical
        // branches too: a low optical branch's h^2 error is as large as a cone's); only where the
        // long-wave box takes the cones' first shells (an acoustic shift's difference stencil would
        // cross q = 0 otherwise).
        var acousticBranches = longWaves is { } box ? Math.Min(box.Branches, branches) : 0;
        var curvedBranches = longWaves is not null && m1 >= 3 && m2 >= 3 && m3 >= 3 ? branches : 0;
        var shifts = new double[6 * Math.Max(curvedBranches, 1)];
        var coneShell = curvedBranches > 0 ? ConeShell.Around(longWaves!.Value, m1, m2, m3) : null;
        var pivots = new double[shifts.Length];
        var hessians = new double[shifts.Length];
        var splits = new bool[shifts.Length];
        Span<double> cornerSteps = stackalloc double[12];
        Span<double> cornerValues = stackalloc double[4];
        var branchTops = new double[curvedBranches];
        var branchBottoms = new double[curvedBranches];
        for (var b = 0; b < curvedBranches; b++)
        {
            branchTops[b] = double.NegativeInfinity;
            branchBottoms[b] = double.PositiveInfinity;
            for (long p = 0; p < (long)m1 * m2 * m3; p++)
            {
                branchTops[b] = Math.Max(branchTops[b], frequencyThz[(p * branches) + b]);
                branchBottoms[b] = Math.Min(branchBottoms[b], frequencyThz[(p * branches) + b]);
            }

            // An acoustic branch's floor is 0 (q = 0), whatever round-off the mesh value there carries.
            branchBottoms[b] = b < acousticBranches ? 0.0 : branchBottoms[b];
        }

        var imageCorners = new int[8 * operations.Count];
        var classWeight = new double[operations.Count];
        var orbitCornerWeights = useWeights && operations.Count > 1 ? new double[8 * branches * channels] : [];
        for (var i1 = 0; i1 < m1; i1++)
        {
            var j1 = i1 + 1 == m1 ? 0 : i1 + 1;
            for (var i2 = 0; i2 < m2; i2++)
            {
                var j2 = i2 + 1 == m2 ? 0 : i2 + 1;
                for (var i3 = 0; i3 < m3; i3++)
                {
                    // A cube's images under the axis permutations, each with and without inversion: the
                    // cube of the lowest index integrates the orbit (permuted axes have equal counts,
                    // so their inversion images agree).
                    var self = ((i1 * m2) + i2) * m3 + i3;
                    (cubeBase[0], cubeBase[1], cubeBase[2]) = (i1, i2, i3);
                    var lower = false;
                    for (var g = 0; g < operations.Count && !lower; g++)
                    {
                        var p = operations[g];
                        var (n1, n2, n3) = (cubeBase[p[0]], cubeBase[p[1]], cubeBase[p[2]]);
                        orbit[2 * g] = ((n1 * m2) + n2) * m3 + n3;
                        orbit[(2 * g) + 1] = ((inverted[0][n1] * m2) + inverted[1][n2]) * m3 + inverted[2][n3];
                        lower = orbit[2 * g] < self || orbit[(2 * g) + 1] < self;
                    }

                    // A layered crystal's column along its slow axis goes to SlowAxisColumn's quadrature, whole; its cells'
                    // images under inversion and the axis permutations (which keep the box) are column cells too.
                    if (lower || (longWaves is { } column && column.SkipsCell(i1, i2, i3, m1, m2, m3)))
                    {
                        continue;
                    }

                    var orbitCubes = DistinctCount(orbit);
                    var cubeShare = share * orbitCubes;
                    var orbitClasses = useWeights && operations.Count > 1
                        ? OrbitImageCorners(cubeBase, operations, orbit, (m1, m2, m3), imageCorners, classWeight)
                        : 0;
                    if (orbitClasses > 0)
                    {
                        SumOverOrbit(branches * channels, weights!, imageCorners, classWeight, orbitClasses, orbitCornerWeights);
                    }

                    // The box around q = 0 is inversion-symmetric: a cube and its image are both in or both out.
                    var firstBranch = longWaves?.FirstSimplexBranch(i1, i2, i3, m1, m2, m3) ?? 0;
                    var j3 = i3 + 1 == m3 ? 0 : i3 + 1;

                    corners[0] = ((i1 * m2) + i2) * m3 + i3;
                    corners[1] = ((j1 * m2) + i2) * m3 + i3;
                    corners[2] = ((i1 * m2) + j2) * m3 + i3;
                    corners[3] = ((j1 * m2) + j2) * m3 + i3;
                    corners[4] = ((i1 * m2) + i2) * m3 + j3;
                    corners[5] = ((j1 * m2) + i2) * m3 + j3;
                    corners[6] = ((i1 * m2) + j2) * m3 + j3;
                    corners[7] = ((j1 * m2) + j2) * m3 + j3;

                    // Every branch the tetrahedra take here (the acoustic ones only outside the box) lowered by its mean interpolation error.
                    var curved = curvedBranches;
                    var nearCone = coneShell is not null && coneShell.Contains(i1, i2, i3, firstBranch);
                    for (var b = firstBranch; b < curved; b++)
                    {
                        if (nearCone)
                        {
                            TetrahedronCurvature.CubeShifts(frequencyThz, branches, b, m1, m2, m3, i1, i2, i3, corners, branchBottoms[b], branchTops[b], shifts.AsSpan(6 * b, 6), pivots.AsSpan(6 * b, 6), hessians.AsSpan(6 * b, 6), splits.AsSpan(6 * b, 6));
                        }
                        else
                        {
                            TetrahedronCurvature.CubeShifts(frequencyThz, branches, b, m1, m2, m3, i1, i2, i3, corners, branchBottoms[b], branchTops[b], shifts.AsSpan(6 * b, 6));
                        }
                    }

                    // Next to the cone (ConeShell) only: a cube with a tetrahedron to split (QuadraticTetrahedron) goes through the scalar kernel.
                    var split = nearCone && splits.AsSpan(6 * firstBranch, 6 * (curved - firstBranch)).Contains(true);

                    var entry = 0;
                    var vectorsHere = vectors && !split;
                    if (vectorsHere)
                    {
                        for (var t = 0; t < 24; t += 4)
                        {
                            var c0 = corners[TetrahedronCorners[t]] * branches;
                            var c1 = corners[TetrahedronCorners[t + 1]] * branches;
                            var c2 = corners[TetrahedronCorners[t + 2]] * branches;
                            var c3 = corners[TetrahedronCorners[t + 3]] * branches;
                            for (var b = firstBranch; b < branches; b++, entry++)
                            {
                                var lift = b < curved ? shifts[(6 * b) + (t / 4)] : 0.0;
                                cornerA[entry] = frequencyThz[c0 + b] - lift;
                                cornerB[entry] = frequencyThz[c1 + b] - lift;
                                cornerC[entry] = frequencyThz[c2 + b] - lift;
                                cornerD[entry] = frequencyThz[c3 + b] - lift;
                            }
                        }

                        kernel.PrepareBatch(cornerA, cornerB, cornerC, cornerD, entry);
                        if (!useWeights)
                        {
                            kernel.AddPreparedBatch(entry, cubeShare, paddedTotal);
                            continue;
                        }

                        entry = 0;
                    }

                    for (var t = 0; t < 24; t += 4)
                    {
                        var c0 = corners[TetrahedronCorners[t]] * branches;
                        var c1 = corners[TetrahedronCorners[t + 1]] * branches;
                        var c2 = corners[TetrahedronCorners[t + 2]] * branches;
                        var c3 = corners[TetrahedronCorners[t + 3]] * branches;
                        for (var b = firstBranch; b < branches; b++)
                        {
                            if (orbitClasses > 0)
                            {
                                OrbitMeanWeight(t, b, branches, channels, orbitCornerWeights, orbitCubes, meanWeight);
                            }
                            else if (useWeights)
                            {
                                Array.Clear(meanWeight);
                                foreach (var c in (ReadOnlySpan<int>)[c0, c1, c2, c3])
                                {
                                    var baseIndex = (c + b) * channels;
                                    for (var ch = 0; ch < channels; ch++)
                                    {
                                        meanWeight[ch] += weights![baseIndex + ch] / 4;
                                    }
                                }
                            }

                            if (vectorsHere)
                            {
                                kernel.AddPrepared(entry++, cubeShare, paddedTotal, paddedPartial, useWeights ? channels : 0, meanWeight);
                            }
                            else
                            {
                                var (f0, f1, f2, f3) = (frequencyThz[c0 + b], frequencyThz[c1 + b], frequencyThz[c2 + b], frequencyThz[c3 + b]);
                                var shift = b < curved ? shifts[(6 * b) + (t / 4)] : 0.0;
                                if (split && splits[(6 * b) + (t / 4)])
                                {
                                    for (var k = 0; k < 4; k++)
                                    {
                                        var corner = TetrahedronCorners[t + k];
                                        (cornerSteps[3 * k], cornerSteps[(3 * k) + 1], cornerSteps[(3 * k) + 2]) = (corner & 1, (corner >> 1) & 1, (corner >> 2) & 1);
                                    }

                                    (cornerValues[0], cornerValues[1], cornerValues[2], cornerValues[3]) = (f0, f1, f2, f3);
                                    QuadraticTetrahedron.Add(kernel, cornerSteps, cornerValues, hessians.AsSpan(6 * b, 6), pivots[(6 * b) + (t / 4)], branchBottoms[b], branchTops[b], cubeShare, paddedTotal, paddedPartial, useWeights ? channels : 0, meanWeight);
                                    continue;
                                }

                                kernel.Add(
                                    f0 - shift, f1 - shift, f2 - shift, f3 - shift,
                                    cubeShare, paddedTotal, paddedPartial, useWeights ? channels : 0, meanWeight);
                            }
                        }
                    }
                }
            }
        }

        for (var bin = 0; bin < grid.Bins; bin++)
        {
            total[bin] += paddedTotal[bin];
            for (var ch = 0; ch < paddedPartial.Length / stride; ch++)
            {
                partial[(ch * grid.Bins) + bin] += paddedPartial[(ch * stride) + bin];
            }
        }
    }

    /// <summary>
    /// The orbit's cubes by class {g C, -g C} (a class is two cubes, or one where -g C = g C; classes are
    /// equal or disjoint since inversion commutes with the permutations): for each class, the mesh
    /// points at the corners of g C in the order of C's corners (corner c of C at offsets o goes to the
    /// point whose index along axis a is base[p[a]] + o[p[a]]), and the class's cube count. -g C needs no
    /// corners of its own: its points are the negatives of g C's, whose weights are the same.
    /// Returns the number of classes.
    /// </summary>
    private static int OrbitImageCorners(
        ReadOnlySpan<int> cubeBase, IReadOnlyList<int[]> operations, ReadOnlySpan<int> orbit, (int M1, int M2, int M3) mesh,
        int[] imageCorners, double[] classWeight)
    {
        var (m1, m2, m3) = mesh;
        var classes = 0;
        Span<int> low = stackalloc int[3];
        Span<int> high = stackalloc int[3];
        ReadOnlySpan<int> counts = [m1, m2, m3];
        for (var g = 0; g < operations.Count; g++)
        {
            if (orbit[..(2 * g)].Contains(orbit[2 * g]))
            {
                continue;
            }

            var p = operations[g];
            for (var a = 0; a < 3; a++)
            {
                low[a] = cubeBase[p[a]];
                high[a] = low[a] + 1 == counts[a] ? 0 : low[a] + 1;
            }

            for (var c = 0; c < 8; c++)
            {
                // Bit p[a] of c is the offset along the axis the image's axis a takes its index from.
                var n1 = ((c >> p[0]) & 1) == 0 ? low[0] : high[0];
                var n2 = ((c >> p[1]) & 1) == 0 ? low[1] : high[1];
                var n3 = ((c >> p[2]) & 1) == 0 ? low[2] : high[2];
                imageCorners[(8 * classes) + c] = ((n1 * m2) + n2) * m3 + n3;
            }

            classWeight[classes] = orbit[2 * g] == orbit[(2 * g) + 1] ? 1 : 2;
            classes++;
        }

        return classes;
    }

    /// <summary>
    /// Per corner of the representative cube, the weights of every mode summed over the orbit's cubes
    /// (the corner's image in each class, times the class's cube count): [corner * perPoint + i], where
    /// a point's perPoint = branches x channels weights are contiguous.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    private static void SumOverOrbit(int perPoint, double[] weights, int[] imageCorners, double[] classWeight, int classes, double[] sums)
    {
        for (var c = 0; c < 8; c++)
        {
            var target = sums.AsSpan(c * perPoint, perPoint);
            target.Clear();
            for (var k = 0; k < classes; k++)
            {
                var source = weights.AsSpan(imageCorners[(8 * k) + c] * perPoint, perPoint);
                var scale = classWeight[k];
                for (var i = 0; i < perPoint; i++)
                {
                    target[i] += source[i] * scale;
                }
            }
        }
    }

    /// <summary>
    /// The channel weights of tetrahedron t (its first corner index in <see cref="TetrahedronCorners"/>),
    /// branch b, averaged over its four corners and over every cube of the orbit (from
    /// <see cref="SumOverOrbit"/>): the states the orbit's tetrahedra add are the same in every bin
    /// (their corner frequencies agree), so the full sum's amount x weight per cube is the amount x
    /// this mean, whatever the weights at the images are.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)] // hot: full optimisation from the first call (DEVELOPERS.md, "Hot kernels")
    private static void OrbitMeanWeight(int t, int b, int branches, int channels, double[] orbitCornerWeights, int orbitCubes, double[] meanWeight)
    {
        var perPoint = branches * channels;
        var scale = 1.0 / (4.0 * orbitCubes);
        var c0 = (TetrahedronCorners[t] * perPoint) + (b * channels);
        var c1 = (TetrahedronCorners[t + 1] * perPoint) + (b * channels);
        var c2 = (TetrahedronCorners[t + 2] * perPoint) + (b * channels);
        var c3 = (TetrahedronCorners[t + 3] * perPoint) + (b * channels);
        for (var ch = 0; ch < channels; ch++)
        {
            meanWeight[ch] = (orbitCornerWeights[c0 + ch] + orbitCornerWeights[c1 + ch] + orbitCornerWeights[c2 + ch] + orbitCornerWeights[c3 + ch]) * scale;
        }
    }

    /// <summary>How many different values the (short) span holds.</summary>
    private static int DistinctCount(Span<int> values)
    {
        var count = 0;
        for (var i = 0; i < values.Length; i++)
        {
            if (!values[..i].Contains(values[i]))
            {
                count++;
            }
        }

        return count;
    }

    /// <summary>Base index of the image of each cube along one axis: mesh index i is n = i - floor(M/2), and -(n + 1) maps back.</summary>
    private static int[] ImageOfCubes(int m)
    {
        var image = new int[m];
        var h = m / 2;
        for (var i = 0; i < m; i++)
        {
            image[i] = (((2 * h) - i - 1) % m + m) % m;
        }

        return image;
    }

    private static void AddSimplex(
        int[] simplex, int[] corners, int branch, int branches, double[] frequencyThz, double[]? weights, int channels,
        FrequencyGrid grid, double share, double[] total, double[] partial, double[] e, int[] order, double[] meanWeight, double lift, double[]? intervalEnds = null)
    {
        var k = simplex.Length;
        for (var v = 0; v < k; v++)
        {
            order[v] = corners[simplex[v]];
            e[v] = frequencyThz[order[v] * branches + branch] - lift;
        }

        Array.Sort(e, 0, k);
        if (intervalEnds is not null)
        {
            // An interval's states spread over the range IntervalCurvature gave (sorted).
            (e[0], e[1]) = (intervalEnds[0], intervalEnds[1]);
        }

        if (weights is not null && channels > 0)
        {
            Array.Clear(meanWeight);
            for (var v = 0; v < k; v++)
            {
                var baseIndex = (order[v] * branches + branch) * channels;
                for (var c = 0; c < channels; c++)
                {
                    meanWeight[c] += weights[baseIndex + c] / k;
                }
            }
        }

        var spread = e[k - 1] - e[0];
        var firstBin = grid.BinOf(e[0]);
        var lastBin = grid.BinOf(e[k - 1]);
        if (firstBin == lastBin || spread <= 1e-12 * Math.Max(Math.Abs(e[k - 1]), grid.WidthThz))
        {
            Deposit(firstBin, share, total, partial, grid.Bins, weights is null ? 0 : channels, meanWeight);
            return;
        }

        // Separate coincident corners by a hair so the closed forms never divide by zero; the
        // shift is far below a bin width, so the binned result is unchanged.
        var delta = 1e-9 * spread;
        for (var v = 1; v < k; v++)
        {
            if (e[v] < e[v - 1] + delta)
            {
                e[v] = e[v - 1] + delta;
            }
        }

        var below = 0.0;
        for (var bin = firstBin; bin <= lastBin; bin++)
        {
            var upperEdge = grid.Edge(bin + 1);
            var cumulative = bin == lastBin ? 1.0 : k switch
            {
                2 => SimplexCumulative.Interval(upperEdge, e[0], e[1]),
                3 => SimplexCumulative.Triangle(upperEdge, e[0], e[1], e[2]),
                _ => SimplexCumulative.Tetrahedron(upperEdge, e[0], e[1], e[2], e[3]),
            };
            var amount = (cumulative - below) * share;
            below = cumulative;
            if (amount != 0)
            {
                Deposit(bin, amount, total, partial, grid.Bins, weights is null ? 0 : channels, meanWeight);
            }
        }
    }

    /// <summary>
    /// Moments of one interval's or triangle's states (corner values sorted in e, as AddSimplex left
    /// them): uniform density on an interval; on a triangle, density rising linearly from e1 to e2 and
    /// falling linearly to e3 (the derivatives of <see cref="SimplexCumulative"/>).
    /// </summary>
    private static void AddMoments(int k, double[] e, double share, FrequencyGrid grid, BinMoments moments)
    {
        var spread = e[k - 1] - e[0];
        if (spread <= 1e-12 * Math.Max(Math.Abs(e[k - 1]), grid.WidthThz))
        {
            moments.AddPoint(grid, e[0], share);
            return;
        }

        if (k == 2)
        {
            moments.AddPiece(grid, e[0], e[1], share / spread, 0, 0);
            return;
        }

        // Coincident corners apart by a hair, as AddSimplex does (its early return skips that).
        e[1] = Math.Max(e[1], e[0] + (1e-9 * spread));
        e[2] = Math.Max(e[2], e[1] + (1e-9 * spread));
        var rise = 2 * share / ((e[1] - e[0]) * (e[2] - e[0]));
        moments.AddPiece(grid, e[0], e[1], 0, rise, 0);
        var fall = 2 * share / ((e[2] - e[0]) * (e[2] - e[1]));
        moments.AddPiece(grid, e[1], e[2], fall * (e[2] - e[1]), -fall, 0);
    }

    private static void Deposit(int bin, double amount, double[] total, double[] partial, int bins, int channels, double[] meanWeight)
    {
        total[bin] += amount;
        for (var c = 0; c < channels; c++)
        {
            partial[c * bins + bin] += amount * meanWeight[c];
        }
    }
}
