using MathNet.Numerics.LinearAlgebra;

namespace LatticeSweep.Audit;

/// <summary>
/// Round 30: what a free-surface sample's eigenvectors put where, against the kit's own modes of the whole sample (Cluster):
/// the surface-mode fraction (README `surface_mode_fraction`), each layer's density of states (`layer_dos/`) and the partial
/// density of states per basis site (`dos/` curve "site"). The weight of a mode on a set of atoms is the squared length of
/// its unit mass-weighted eigenvector on their coordinates (the eigenvector weights of README "Partial DOS per site";
/// common practice, e.g. A&M ch. 22 for the normal modes).
/// </summary>
internal static class SurfaceWeights
{
    // modes whose omega^2 lie within this fraction of the top one are one degenerate set: the engine may return any basis of
    // it, so only basis-free quantities of the set are compared (its summed weights, or the interval below). Wider than the
    // two solvers' round-off (1e-12) so that a nearly degenerate pair mixed by round-off is treated as the set it is
    private const double DegenerateRelative = 1e-6;

    public static void Check(Context x, string id, int row, Cluster cluster, double[] lambda, Matrix<double> vectors, double top, int[] depth)
    {
        var c = x.Case.Model.Components;
        var atoms = cluster.Atoms.Count;
        var surface = depth.Select(v => v == 0).ToArray();
        ModeFraction(x, row, surface, c, lambda, vectors, top);

        var thz = lambda.Select(l => Units.ThzFromOmega(Math.Sqrt(Math.Max(l, 0)))).ToArray();
        var fTop = thz.Max();
        var sites = x.Case.Model.Sites.Length;
        var cells = (double)atoms / sites;

        // partial DOS per basis site: the weight of every mode on that site's atoms, per cell (atoms / sites, as the total)
        var dos = x.Table("dos");
        var partialRows = dos.RowsOf(id).Where(r => dos.Text("curve", r) == "site").ToList();
        if (partialRows.Count == 0)
        {
            x.Ledger.NoReference("surface.partial_dos");
        }

        for (var s = 0; s < sites; s++)
        {
            var members = Enumerable.Range(0, atoms).Where(a => cluster.Atoms[a].Site == s).ToArray();
            var rows = partialRows.Where(r => (int?)dos.Number("site", r) == s).OrderBy(r => dos.Number("freq_thz", r)).ToList();
            if (rows.Count < 2)
            {
                continue;
            }

            CompareWeighted(x, "surface.partial_dos", $"site {s}", rows.Select(r => dos.Number("freq_thz", r)!.Value).ToArray(),
                rows.Select(r => dos.Number("dos_per_thz_per_cell", r) ?? 0).ToArray(), Weights(members, c, vectors), thz, fTop, cells,
                "the kit's modes weighted by their eigenvectors on the site's atoms, histogram on the engine's bins, per cell = atoms / sites (README partial_dos, dos_bins)");
        }

        // each layer's DOS per atom of the layer (README layer_dos/: integrates to the components of motion)
        var layerDos = x.Table("layer_dos");
        var layerRows = layerDos.RowsOf(id).ToList();
        if (x.Case.Kind == "surfacelayers" && layerRows.Count == 0)
        {
            x.Ledger.NoReference("surface.layer_dos");
        }

        foreach (var layer in layerRows.Select(r => (int)layerDos.Number("layer", r)!.Value).Distinct().Order())
        {
            var rows = layerRows.Where(r => (int)layerDos.Number("layer", r)!.Value == layer).OrderBy(r => layerDos.Number("freq_thz", r)).ToList();
            var members = Enumerable.Range(0, atoms).Where(a => depth[a] == layer).ToArray();
            x.Add("surface.layer_dos_sites", $"layer {layer}", layerDos.Number("sites", rows[0]), members.Length, 0.5, "atoms of that depth, counted by the kit");
            if (members.Length == 0 || rows.Count < 2)
            {
                continue;
            }

            CompareWeighted(x, "surface.layer_dos", $"layer {layer}", rows.Select(r => layerDos.Number("freq_thz", r)!.Value).ToArray(),
                rows.Select(r => layerDos.Number("dos_per_thz_per_atom", r) ?? 0).ToArray(), Weights(members, c, vectors), thz, fTop, members.Length,
                "the kit's modes weighted by their eigenvectors on the layer's atoms, histogram on the engine's bins, per atom of the layer (README layer_dos/)");
        }
    }

    /// <summary>
    /// The fraction of non-zero modes with at least the threshold of their weight on surface atoms (a share within 1e-9 below
    /// it counts, README). Within a degenerate set the count depends on the basis chosen, so the reference is the interval
    /// of counts that some orthonormal basis of the set gives: the weights of a basis are the diagonal of the set's k x k
    /// matrix A = V^T S V (S the surface projector), and by the Schur-Horn theorem (Horn, Am. J. Math. 76, 620 (1954)) the
    /// diagonals reachable are those majorized by A's eigenvalues mu; so at most the largest m with mean(top m mu) >= t of
    /// them can count, and at least k minus the largest j with mean(bottom j mu) below t (own derivation from the theorem).
    /// </summary>
    private static void ModeFraction(Context x, int row, bool[] surface, int c, double[] lambda, Matrix<double> vectors, double top)
    {
        var engine = x.Points.Number("surface_mode_fraction", row);
        var threshold = x.Case.SurfaceWeightThreshold ?? 0.5;
        x.Add("surface.surface_weight_threshold", "points/", x.Points.Number("surface_weight_threshold", row), threshold, 1e-15,
            "the job file's sample.surface_weight_threshold (README default 0.5)");
        if (!surface.Any(s => s))
        {
            x.Ledger.NoReference("surface.surface_mode_fraction"); // no surface atom: every mode has weight 0 there
            if (engine is { } e0)
            {
                x.Add("surface.surface_mode_fraction", "no surface atoms", e0, 0, 1e-15, "no atom lost a nearest neighbour, so no mode has weight on the surface");
            }

            return;
        }

        var (lo, hi, n, sets, ambiguousSets) = SurfaceModeCount(surface, c, lambda, vectors, top, threshold);
        if (n == 0)
        {
            return;
        }

        var mid = (lo + hi) / 2.0 / n;
        x.Add("surface.surface_mode_fraction", $"t = {threshold}; {n} modes, {lo}-{hi} surface modes ({ambiguousSets} of {sets} sets basis-dependent)",
            engine, mid, (hi - lo) / 2.0 / n + 1e-12,
            "the kit's modes: count of modes with surface weight >= t - 1e-9, over a degenerate set the range any basis allows (Schur-Horn); the interval's half-width is the tolerance");
    }

    /// <summary>
    /// The range of surface-mode counts (weight on the surface atoms at least t - 1e-9) that orthonormal bases of the
    /// degenerate sets allow, the non-zero modes (omega^2 at least 1e-14 of the top), the sets and the basis-dependent ones.
    /// </summary>
    public static (int Lo, int Hi, int Modes, int Sets, int Ambiguous) SurfaceModeCount(bool[] surface, int c, double[] lambda, Matrix<double> vectors, double top, double threshold)
    {
        var nonZero = Enumerable.Range(0, lambda.Length).Where(k => lambda[k] >= 1e-14 * top).ToList();
        // 1e-10 either side of the README's tie band (t - 1e-9): weights of separate modes carry round-off of ~1e-12
        var countsAt = threshold - 1e-9;
        int lo = 0, hi = 0, sets = 0, ambiguousSets = 0;
        for (var start = 0; start < nonZero.Count;)
        {
            var end = start + 1;
            while (end < nonZero.Count && lambda[nonZero[end]] - lambda[nonZero[end - 1]] <= DegenerateRelative * top)
            {
                end++;
            }

            var k = end - start;
            var a = Matrix<double>.Build.Dense(k, k, (i, j) =>
            {
                var sum = 0.0;
                for (var atom = 0; atom < surface.Length; atom++)
                {
                    if (!surface[atom])
                    {
                        continue;
                    }

                    for (var e = 0; e < c; e++)
                    {
                        sum += vectors[atom * c + e, nonZero[start + i]] * vectors[atom * c + e, nonZero[start + j]];
                    }
                }

                return sum;
            });
            var mu = k == 1 ? [a[0, 0]] : a.Evd(MathNet.Numerics.LinearAlgebra.Symmetricity.Symmetric).EigenValues.Select(v => v.Real).OrderByDescending(v => v).ToArray();
            var most = 0;
            var run = 0.0;
            for (var m = 1; m <= k; m++)
            {
                run += mu[m - 1];
                if (run / m >= countsAt - 1e-10)
                {
                    most = m;
                }
            }

            var below = 0;
            run = 0;
            for (var j = 1; j <= k; j++)
            {
                run += mu[k - j];
                if (run / j < countsAt + 1e-10)
                {
                    below = j;
                }
            }

            hi += most;
            lo += k - below;
            sets++;
            ambiguousSets += most != k - below ? 1 : 0;
            start = end;
        }

        return (lo, hi, nonZero.Count, sets, ambiguousSets);
    }

    /// <summary>Weight of every mode (column) on the given atoms: the squared length of its unit eigenvector there.</summary>
    private static double[] Weights(int[] members, int c, Matrix<double> vectors)
    {
        var w = new double[vectors.ColumnCount];
        for (var k = 0; k < w.Length; k++)
        {
            var sum = 0.0;
            foreach (var a in members)
            {
                for (var e = 0; e < c; e++)
                {
                    var v = vectors[a * c + e, k];
                    sum += v * v;
                }
            }

            w[k] = sum;
        }

        return w;
    }

    /// <summary>
    /// A weighted histogram of the kit's modes on the engine's bins (edges half a width either side of each centre), divided by
    /// <paramref name="per"/> and the width. A degenerate set's summed weight is basis-free, and such a set lies in one bin;
    /// bins with a mode within 1e-9 of the top frequency of an edge are skipped (which side is round-off), as for the total.
    /// </summary>
    private static void CompareWeighted(Context x, string quantity, string label, double[] centres, double[] engine, double[] weight, double[] thz, double fTop, double per, string source)
    {
        var width = (centres[^1] - centres[0]) / (centres.Length - 1);
        var lo = centres[0] - width / 2;
        var reference = new double[centres.Length];
        var ambiguous = new bool[centres.Length];
        for (var k = 0; k < thz.Length; k++)
        {
            var at = (thz[k] - lo) / width;
            var bin = Math.Clamp((int)Math.Floor(at), 0, centres.Length - 1);
            reference[bin] += weight[k] / per / width;
            var edge = Math.Abs(at - Math.Round(at)) * width;
            if (thz[k] > 1e-9 * fTop && edge < 1e-9 * fTop)
            {
                ambiguous[Math.Clamp((int)Math.Round(at) - 1, 0, centres.Length - 1)] = true;
                ambiguous[Math.Clamp((int)Math.Round(at), 0, centres.Length - 1)] = true;
            }
        }

        var worst = -1.0;
        var at0 = -1;
        for (var b = 0; b < centres.Length; b++)
        {
            if (ambiguous[b])
            {
                continue;
            }

            var diff = Math.Abs(engine[b] - reference[b]);
            if (diff > worst)
            {
                worst = diff;
                at0 = b;
            }
        }

        if (at0 >= 0)
        {
            // one whole mode in a bin is 1 / (per * width): 1e-9 of it is the eigenvectors' round-off
            x.Add(quantity, $"{label}: worst of {centres.Length} bins, bin {at0} at {centres[at0]:G6} THz", engine[at0], reference[at0],
                1e-9 / per / width + 1e-12 * Math.Abs(reference[at0]), source + "; 1e-9 of one mode's height");
        }
    }
}
