using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.Tests.Support;

namespace LatticeSweep.Engine.Tests.Dos;

/// <summary>
/// The 3D fast path (cube pairs under inversion, per-piece edge loops) against a plain loop over every
/// cube and tetrahedron with <see cref="SimplexCumulative.Tetrahedron"/> (Bloechl, Jepsen and Andersen
/// 1994, eq. A2-A4): same split, so the same bin contents to round-off.
/// </summary>
public sealed class SimplexDosIntegratorTests
{
    [Theory]
    [InlineData(4, 5, 6, false)]
    [InlineData(3, 3, 3, false)]
    [InlineData(6, 6, 6, false)]
    [InlineData(4, 5, 6, true)]
    [InlineData(3, 3, 3, true)]
    [InlineData(6, 6, 6, true)]
    public void Tetrahedra_fast_path_matches_the_plain_loop_on_an_inversion_symmetric_mesh(int m1, int m2, int m3, bool vectors)
    {
        const int branches = 2;
        const int channels = 2;
        var (frequencies, weights) = SymmetricMeshValues(m1, m2, m3, branches, channels, quantum: 0);
        var grid = FrequencyGrid.Covering(0, frequencies.Max(), 37);
        var total = new double[grid.Bins];
        var partial = new double[channels * grid.Bins];
        SimplexDosIntegrator.Accumulate(3, (m1, m2, m3), branches, frequencies, weights, channels, grid, total, partial, vectors);

        var (expected, expectedPartial) = PlainLoop((m1, m2, m3), branches, channels, frequencies, weights, grid);
        Tolerance.AssertAllClose(expected, total, 0, 1e-13, "total per bin");
        Tolerance.AssertAllClose(expectedPartial, partial, 0, 1e-13, "partial per bin");
        Tolerance.AssertClose(branches, total.Sum(), 1e-13, 0, "states per cell");
    }

    /// <summary>
    /// The 256-bit kernel evaluates the same formulas in the same order as the scalar one, so the DOS
    /// must come out bit for bit the same, with and without channels, on fine bins (tetrahedra spanning
    /// from one to dozens of bins, so every lane position of the first and last bin occurs) and with
    /// coincident corner values (values rounded to a coarse quantum), which take the separated-corner
    /// and single-bin branches.
    /// </summary>
    [Theory]
    [InlineData(12, 12, 12, 0.0, 2200)]
    [InlineData(9, 10, 11, 0.0, 400)]
    [InlineData(8, 8, 8, 0.25, 600)]
    [InlineData(7, 6, 5, 0.0, 3)]
    public void Vector_and_scalar_tetrahedron_kernels_give_the_same_bits(int m1, int m2, int m3, double quantum, int bins)
    {
        if (!System.Runtime.Intrinsics.X86.Avx2.IsSupported)
        {
            return; // no AVX2: the vector kernel is the scalar one here
        }

        const int branches = 3;
        const int channels = 3;
        var (frequencies, weights) = SymmetricMeshValues(m1, m2, m3, branches, channels, quantum);
        var grid = FrequencyGrid.Covering(0, frequencies.Max(), bins);
        Assert.True(new TetrahedronBins(grid, useVectors: true).UsesVectors);
        foreach (var withWeights in new[] { false, true })
        {
            var results = new[] { true, false }.Select(vectors =>
            {
                var total = new double[grid.Bins];
                var partial = withWeights ? new double[channels * grid.Bins] : [];
                SimplexDosIntegrator.Accumulate(3, (m1, m2, m3), branches, frequencies, withWeights ? weights : null, withWeights ? channels : 0, grid, total, partial, vectors);
                return (total, partial);
            }).ToArray();

            Assert.Equal(results[1].total, results[0].total);
            Assert.Equal(results[1].partial, results[0].partial);
            Tolerance.AssertClose(branches, results[0].total.Sum(), 1e-12, 0, "states per cell");
        }
    }

    /// <summary>Random values with omega(-q) = omega(q) (the integrator's inversion pairing needs it); optionally rounded to a quantum.</summary>
    private static (double[] Frequencies, double[] Weights) SymmetricMeshValues(int m1, int m2, int m3, int branches, int channels, double quantum)
    {
        var random = new Random(m1 * 100 + m2 * 10 + m3);
        var count = m1 * m2 * m3;
        var frequencies = new double[count * branches];
        var weights = new double[count * branches * channels];
        for (var i1 = 0; i1 < m1; i1++)
        {
            for (var i2 = 0; i2 < m2; i2++)
            {
                for (var i3 = 0; i3 < m3; i3++)
                {
                    var self = ((i1 * m2) + i2) * m3 + i3;
                    var partner = ((PeriodicGrid.Partner(i1, m1) * m2) + PeriodicGrid.Partner(i2, m2)) * m3 + PeriodicGrid.Partner(i3, m3);
                    if (partner < self)
                    {
                        continue; // omega(-q) = omega(q): the partner shares the values
                    }

                    for (var b = 0; b < branches; b++)
                    {
                        var f = (b * 3.0) + (2.5 * random.NextDouble());
                        if (quantum > 0)
                        {
                            f = Math.Round(f / quantum) * quantum;
                        }

                        var w = random.NextDouble();
                        foreach (var index in new[] { self, partner })
                        {
                            frequencies[index * branches + b] = f;
                            for (var ch = 0; ch < channels; ch++)
                            {
                                // weights sum to 1 per mode: w, then (1 - w) split over the rest
                                weights[(index * branches + b) * channels + ch] = ch == 0 ? w : (1 - w) / (channels - 1);
                            }
                        }
                    }
                }
            }
        }

        return (frequencies, weights);
    }

    private static (double[] Total, double[] Partial) PlainLoop(
        (int M1, int M2, int M3) mesh, int branches, int channels, double[] frequencies, double[] weights, FrequencyGrid grid)
    {
        int[][] tetrahedra = [[0, 1, 3, 7], [0, 1, 5, 7], [0, 2, 3, 7], [0, 2, 6, 7], [0, 4, 5, 7], [0, 4, 6, 7]];
        var (m1, m2, m3) = mesh;
        var total = new double[grid.Bins];
        var partial = new double[channels * grid.Bins];
        var share = 1.0 / 6.0 / (m1 * m2 * m3);
        for (var i1 = 0; i1 < m1; i1++)
        {
            for (var i2 = 0; i2 < m2; i2++)
            {
                for (var i3 = 0; i3 < m3; i3++)
                {
                    foreach (var tet in tetrahedra)
                    {
                        var corners = tet.Select(c => ((((i1 + (c & 1)) % m1) * m2) + ((i2 + ((c >> 1) & 1)) % m2)) * m3 + ((i3 + ((c >> 2) & 1)) % m3)).ToArray();
                        for (var b = 0; b < branches; b++)
                        {
                            var e = corners.Select(c => frequencies[c * branches + b]).Order().ToArray();

                            // The method separates coincident corners by 1e-9 of the spread (far below a bin).
                            for (var v = 1; v < 4; v++)
                            {
                                e[v] = Math.Max(e[v], e[v - 1] + (1e-9 * (e[3] - e[0])));
                            }

                            var mean = Enumerable.Range(0, channels).Select(ch => corners.Average(c => weights[(c * branches + b) * channels + ch])).ToArray();
                            var below = 0.0;
                            for (var bin = 0; bin < grid.Bins; bin++)
                            {
                                var cumulative = bin == grid.Bins - 1 ? 1.0 : SimplexCumulative.Tetrahedron(grid.Edge(bin + 1), e[0], e[1], e[2], e[3]);
                                var amount = (cumulative - below) * share;
                                below = cumulative;
                                total[bin] += amount;
                                for (var ch = 0; ch < channels; ch++)
                                {
                                    partial[ch * grid.Bins + bin] += amount * mean[ch];
                                }
                            }
                        }
                    }
                }
            }
        }

        return (total, partial);
    }
}
