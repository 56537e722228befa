using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Dos;

/// <summary>
/// The axis permutations the tetrahedron sum may use: found only where the frequencies have them
/// (invented random fields with a chosen symmetry), and the sum over one cube per orbit against the
/// full sum over every cube (itself held to the plain loop of Bloechl, Jepsen and Andersen 1994,
/// eq. A2-A4, in <see cref="SimplexDosIntegratorTests"/>): the same states, total and per channel, to
/// round-off, channel weights without any symmetry included.
/// </summary>
public sealed class MeshAxisPermutationsTests
{
    private static readonly int[][] AllSix = [[0, 1, 2], [1, 0, 2], [0, 2, 1], [2, 1, 0], [1, 2, 0], [2, 0, 1]];

    [Theory]
    [InlineData(6, 6, 6)]
    [InlineData(5, 5, 5)]
    public void Finds_all_six_permutations_where_the_field_has_them(int m1, int m2, int m3)
    {
        var frequencies = Field((m1, m2, m3), 3, AllSix, seed: 1);
        var found = MeshAxisPermutations.Find((m1, m2, m3), 3, frequencies, null);
        Assert.Equal(6, found.Order);
        Assert.Equal([0, 1, 2], found.Permutations[0]);
    }

    [Fact]
    public void Finds_only_the_swap_the_field_has()
    {
        var frequencies = Field((6, 6, 6), 2, [[0, 1, 2], [1, 0, 2]], seed: 2);
        var found = MeshAxisPermutations.Find((6, 6, 6), 2, frequencies, null);
        Assert.Equal(2, found.Order);
        Assert.Equal([1, 0, 2], found.Permutations[1]);
    }

    [Fact]
    public void Finds_the_threefold_cycle_without_mirrors()
    {
        var frequencies = Field((6, 6, 6), 2, [[0, 1, 2], [1, 2, 0], [2, 0, 1]], seed: 3);
        var found = MeshAxisPermutations.Find((6, 6, 6), 2, frequencies, null);
        Assert.Equal(3, found.Order);
        Assert.Contains(found.Permutations, p => p.SequenceEqual([1, 2, 0]));
        Assert.Contains(found.Permutations, p => p.SequenceEqual([2, 0, 1]));
    }

    [Fact]
    public void Keeps_the_full_sum_for_a_field_without_the_symmetry()
    {
        var frequencies = Field((6, 6, 6), 2, [[0, 1, 2]], seed: 4);
        Assert.Equal(1, MeshAxisPermutations.Find((6, 6, 6), 2, frequencies, null).Order);
    }

    [Fact]
    public void Takes_only_the_axes_of_equal_mesh_counts()
    {
        // The field is symmetric under every permutation of the index offsets, but the third axis has
        // another count: only the swap of the first two maps the mesh onto itself.
        var frequencies = Field((6, 6, 4), 2, AllSix, seed: 5);
        var found = MeshAxisPermutations.Find((6, 6, 4), 2, frequencies, null);
        Assert.Equal(2, found.Order);
        Assert.Equal([1, 0, 2], found.Permutations[1]);
    }

    [Fact]
    public void Takes_only_the_axes_on_which_the_long_wave_box_agrees()
    {
        var frequencies = Field((6, 6, 6), 2, AllSix, seed: 6);
        Assert.Equal(6, MeshAxisPermutations.Find((6, 6, 6), 2, frequencies, new LongWaveBox(1, 1, 1, 1)).Order);
        var found = MeshAxisPermutations.Find((6, 6, 6), 2, frequencies, new LongWaveBox(1, 2, 1, 1));
        Assert.Equal(2, found.Order);
        Assert.Equal([2, 1, 0], found.Permutations[1]);
    }

    [Fact]
    public void A_difference_above_the_tolerance_breaks_the_symmetry_and_round_off_does_not()
    {
        const int branches = 2;
        var frequencies = Field((6, 6, 6), branches, AllSix, seed: 7);
        var point = ((1 * 6) + 2) * 6 + 4; // offsets (-2, -1, 1): not on a mirror plane
        var roundOff = (double[])frequencies.Clone();
        roundOff[point * branches] *= 1 + 4e-16;
        Assert.Equal(6, MeshAxisPermutations.Find((6, 6, 6), branches, roundOff, null).Order);

        var broken = (double[])frequencies.Clone();
        broken[point * branches] *= 1 + 1e-9;
        Assert.Equal(1, MeshAxisPermutations.Find((6, 6, 6), branches, broken, null).Order);
    }

    [Fact]
    public void A_difference_in_any_branch_of_a_point_breaks_the_symmetry()
    {
        // Six branches, as a two-site 3D crystal: the check takes four per vector step where vectors
        // run and the last two one by one; a difference in any of them (or a NaN) must count.
        const int branches = 6;
        var frequencies = Field((6, 6, 6), branches, AllSix, seed: 8);
        Assert.Equal(6, MeshAxisPermutations.Find((6, 6, 6), branches, frequencies, null).Order);
        var point = ((1 * 6) + 2) * 6 + 4; // offsets (-2, -1, 1): not on a mirror plane
        for (var k = 0; k < branches; k++)
        {
            var broken = (double[])frequencies.Clone();
            broken[(point * branches) + k] *= 1 + 1e-9;
            Assert.Equal(1, MeshAxisPermutations.Find((6, 6, 6), branches, broken, null).Order);

            var notANumber = (double[])frequencies.Clone();
            notANumber[(point * branches) + k] = double.NaN;
            Assert.Equal(1, MeshAxisPermutations.Find((6, 6, 6), branches, notANumber, null, largestThz: frequencies.Max()).Order);
        }
    }

    [Theory]
    [InlineData(6, 6, 6, true, false)]
    [InlineData(6, 6, 6, false, false)]
    [InlineData(7, 7, 7, true, false)]
    [InlineData(7, 7, 7, false, false)]
    [InlineData(8, 8, 8, true, true)]
    [InlineData(8, 8, 8, false, true)]
    [InlineData(6, 6, 5, true, false)]
    public void One_cube_per_orbit_adds_the_states_of_every_cube(int m1, int m2, int m3, bool vectors, bool withBox)
    {
        const int branches = 3;
        var frequencies = Field((m1, m2, m3), branches, AllSix, seed: m1 + m3);
        LongWaveBox? box = withBox ? new LongWaveBox(2, 2, 2, 1) : null;
        var permutations = MeshAxisPermutations.Find((m1, m2, m3), branches, frequencies, box);
        Assert.Equal(m1 == m3 ? 6 : 2, permutations.Order);
        foreach (var bins in new[] { 3, 40, 900 })
        {
            var grid = FrequencyGrid.Covering(0, frequencies.Max(), bins);
            var full = new double[grid.Bins];
            SimplexDosIntegrator.Accumulate(3, (m1, m2, m3), branches, frequencies, null, 0, grid, full, [], box, vectors: vectors);
            var reduced = new double[grid.Bins];
            SimplexDosIntegrator.Accumulate(3, (m1, m2, m3), branches, frequencies, null, 0, grid, reduced, [], box, vectors: vectors, axisPermutations: permutations);

            Tolerance.AssertAllClose(full, reduced, 1e-12, 1e-16, $"total per bin, {bins} bins");
            Tolerance.AssertClose(full.Sum(), reduced.Sum(), 1e-13, 0, "states per cell");
        }
    }

    [Fact]
    public void Vector_and_scalar_kernels_give_the_same_bits_with_permutations()
    {
        if (!System.Runtime.Intrinsics.X86.Avx2.IsSupported)
        {
            return; // no AVX2: the vector kernel is the scalar one here
        }

        const int branches = 3;
        var frequencies = Field((9, 9, 9), branches, AllSix, seed: 9);
        var permutations = MeshAxisPermutations.Find((9, 9, 9), branches, frequencies, null);
        var grid = FrequencyGrid.Covering(0, frequencies.Max(), 2200);
        var results = new[] { true, false }.Select(vectors =>
        {
            var total = new double[grid.Bins];
            SimplexDosIntegrator.Accumulate(3, (9, 9, 9), branches, frequencies, null, 0, grid, total, [], vectors: vectors, axisPermutations: permutations);
            return total;
        }).ToArray();

        Assert.Equal(6, permutations.Order);
        Assert.Equal(results[1], results[0]);
    }

    [Theory]
    [InlineData(6, 6, 6, true, false)]
    [InlineData(7, 7, 7, false, false)]
    [InlineData(8, 8, 8, true, true)]
    [InlineData(8, 8, 8, false, true)]
    [InlineData(6, 6, 5, true, false)]
    public void One_cube_per_orbit_adds_the_channel_states_of_every_cube(int m1, int m2, int m3, bool vectors, bool withBox)
    {
        // The weights are random at every mesh point (equal only at q and -q, as the solver's are): they
        // have none of the frequencies' symmetry, and the orbit still gives the full sum's partial states.
        const int branches = 3;
        const int channels = 4;
        var frequencies = Field((m1, m2, m3), branches, AllSix, seed: m1 + (2 * m3));
        var weights = InversionEvenWeights((m1, m2, m3), branches, channels, seed: m1);
        LongWaveBox? box = withBox ? new LongWaveBox(2, 2, 2, 1) : null;
        var permutations = MeshAxisPermutations.Find((m1, m2, m3), branches, frequencies, box);
        Assert.Equal(m1 == m3 ? 6 : 2, permutations.Order);
        foreach (var bins in new[] { 3, 40, 900 })
        {
            var grid = FrequencyGrid.Covering(0, frequencies.Max(), bins);
            var (full, fullPartial) = (new double[grid.Bins], new double[channels * grid.Bins]);
            SimplexDosIntegrator.Accumulate(3, (m1, m2, m3), branches, frequencies, weights, channels, grid, full, fullPartial, box, vectors: vectors);
            var (reduced, reducedPartial) = (new double[grid.Bins], new double[channels * grid.Bins]);
            SimplexDosIntegrator.Accumulate(3, (m1, m2, m3), branches, frequencies, weights, channels, grid, reduced, reducedPartial, box, vectors: vectors, axisPermutations: permutations);

            Tolerance.AssertAllClose(full, reduced, 1e-12, 1e-16, $"total per bin, {bins} bins");
            Tolerance.AssertAllClose(fullPartial, reducedPartial, 1e-12, 1e-16, $"channel states per bin, {bins} bins");
            for (var ch = 0; ch < channels; ch++)
            {
                Tolerance.AssertClose(fullPartial.AsSpan(ch * grid.Bins, grid.Bins).ToArray().Sum(), reducedPartial.AsSpan(ch * grid.Bins, grid.Bins).ToArray().Sum(), 1e-13, 0, $"states of channel {ch}");
            }
        }
    }

    [Fact]
    public void A_channel_held_by_one_point_and_its_inverse_gets_their_states_exactly()
    {
        // Weights that break the symmetry as far as they can: one point off every mirror (and its
        // inverse, as the solver's weights are even) carries channel 1, every other point channel 0.
        // The representative cubes of most orbits do not touch that point: only reading the images'
        // weights gives it its states.
        const int branches = 1;
        const int channels = 2;
        var mesh = (6, 6, 6);
        var frequencies = Field(mesh, branches, AllSix, seed: 11);
        var weights = new double[frequencies.Length * channels];
        for (var p = 0; p < frequencies.Length; p++)
        {
            weights[p * channels] = 1;
        }

        // One point and its inverse, (-2, -1, 1) and (2, 1, -1), off every mirror: all of channel 1.
        foreach (var point in new[] { ((1 * 6) + 2) * 6 + 4, ((5 * 6) + 4) * 6 + 2 })
        {
            (weights[point * channels], weights[(point * channels) + 1]) = (0, 1);
        }

        var permutations = MeshAxisPermutations.Find(mesh, branches, frequencies, null);
        var grid = FrequencyGrid.Covering(0, frequencies.Max(), 50);
        var (full, fullPartial) = (new double[grid.Bins], new double[channels * grid.Bins]);
        SimplexDosIntegrator.Accumulate(3, mesh, branches, frequencies, weights, channels, grid, full, fullPartial);
        var (reduced, reducedPartial) = (new double[grid.Bins], new double[channels * grid.Bins]);
        SimplexDosIntegrator.Accumulate(3, mesh, branches, frequencies, weights, channels, grid, reduced, reducedPartial, axisPermutations: permutations);

        // A point is corner c = 0..7 of one cube each; corners 0 and 7 lie in all six tetrahedra, the
        // others in two, each tetrahedron 1/6 of a cube's 1/216 and a corner 1/4 of its weight:
        // (6 + 6 x 2 + 6) / (6 x 4 x 216) = 1/216 per point (common practice, no source).
        var channelOne = reducedPartial.AsSpan(grid.Bins, grid.Bins).ToArray().Sum();
        Tolerance.AssertClose(2.0 / 216, channelOne, 1e-12, 0, "states of channel 1");
        Tolerance.AssertAllClose(fullPartial, reducedPartial, 1e-12, 1e-16, "channel states per bin");
    }

    [Fact]
    public void Vector_and_scalar_kernels_give_the_same_bits_with_permutations_and_weights()
    {
        if (!System.Runtime.Intrinsics.X86.Avx2.IsSupported)
        {
            return; // no AVX2: the vector kernel is the scalar one here
        }

        const int branches = 3;
        const int channels = 3;
        var frequencies = Field((9, 9, 9), branches, AllSix, seed: 12);
        var weights = InversionEvenWeights((9, 9, 9), branches, channels, seed: 12);
        var permutations = MeshAxisPermutations.Find((9, 9, 9), branches, frequencies, null);
        var grid = FrequencyGrid.Covering(0, frequencies.Max(), 2200);
        var results = new[] { true, false }.Select(vectors =>
        {
            var (total, partial) = (new double[grid.Bins], new double[channels * grid.Bins]);
            SimplexDosIntegrator.Accumulate(3, (9, 9, 9), branches, frequencies, weights, channels, grid, total, partial, vectors: vectors, axisPermutations: permutations);
            return (total, partial);
        }).ToArray();

        Assert.Equal(6, permutations.Order);
        Assert.Equal(results[1].total, results[0].total);
        Assert.Equal(results[1].partial, results[0].partial);
    }

    /// <summary>
    /// Random channel weights per mode (summing to 1), the same at q and -q and nowhere else alike.
    /// </summary>
    private static double[] InversionEvenWeights((int M1, int M2, int M3) mesh, int branches, int channels, int seed)
    {
        var (m1, m2, m3) = mesh;
        var random = new Random(seed);
        var weights = new double[m1 * m2 * m3 * branches * channels];
        for (var i1 = 0; i1 < m1; i1++)
        {
            for (var i2 = 0; i2 < m2; i2++)
            {
                for (var i3 = 0; i3 < m3; i3++)
                {
                    var point = ((i1 * m2) + i2) * m3 + i3;
                    var n = new[] { Wrap(-(i1 - (m1 / 2)), m1), Wrap(-(i2 - (m2 / 2)), m2), Wrap(-(i3 - (m3 / 2)), m3) };
                    var partner = (((n[0] + (m1 / 2)) * m2) + n[1] + (m2 / 2)) * m3 + n[2] + (m3 / 2);
                    if (partner < point)
                    {
                        Array.Copy(weights, partner * branches * channels, weights, point * branches * channels, branches * channels);
                        continue;
                    }

                    for (var b = 0; b < branches; b++)
                    {
                        var values = Enumerable.Range(0, channels).Select(_ => random.NextDouble() + 0.01).ToArray();
                        var sum = values.Sum();
                        for (var ch = 0; ch < channels; ch++)
                        {
                            weights[(((point * branches) + b) * channels) + ch] = values[ch] / sum;
                        }
                    }
                }
            }
        }

        return weights;
    }

    /// <summary>
    /// Random positive values per branch (branch b in [3b, 3b + 2.5)), equal at all mesh points that the
    /// given permutations of the index offsets and q -> -q map onto each other, and only there.
    /// </summary>
    private static double[] Field((int M1, int M2, int M3) mesh, int branches, int[][] permutations, int seed)
    {
        var (m1, m2, m3) = mesh;
        int[] counts = [m1, m2, m3];
        var random = new Random(seed);
        var byOrbit = new Dictionary<(int, int, int), double[]>();
        var frequencies = new double[m1 * m2 * m3 * branches];
        for (var i1 = 0; i1 < m1; i1++)
        {
            for (var i2 = 0; i2 < m2; i2++)
            {
                for (var i3 = 0; i3 < m3; i3++)
                {
                    int[] offsets = [i1 - (m1 / 2), i2 - (m2 / 2), i3 - (m3 / 2)];
                    var images = new List<(int, int, int)>();
                    foreach (var p in permutations)
                    {
                        foreach (var sign in new[] { 1, -1 })
                        {
                            // Offsets wrapped into the mesh's range, so q and q + G agree.
                            var n = Enumerable.Range(0, 3).Select(a => Wrap(sign * offsets[p[a]], counts[a])).ToArray();
                            images.Add((n[0], n[1], n[2]));
                        }
                    }

                    var key = images.Min();
                    if (!byOrbit.TryGetValue(key, out var values))
                    {
                        values = [.. Enumerable.Range(0, branches).Select(b => (b * 3.0) + (2.5 * random.NextDouble()))];
                        byOrbit[key] = values;
                    }

                    values.CopyTo(frequencies, (((i1 * m2) + i2) * m3 + i3) * branches);
                }
            }
        }

        return frequencies;
    }

    /// <summary>The offset n as one in [-floor(m / 2), m - floor(m / 2)), the mesh's own range.</summary>
    private static int Wrap(int n, int m)
    {
        var i = ((n + (m / 2)) % m + m) % m;
        return i - (m / 2);
    }
}
