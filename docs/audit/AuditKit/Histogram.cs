namespace LatticeSweep.Audit;

/// <summary>
/// The total `dos/` curve of a sample solved mode by mode (README `dos_method = "auto"`: an exact histogram for
/// finite samples) against the kit's own histogram of the same modes on the engine's bins (edges half a bin
/// width either side of each `freq_thz` centre), in states per THz per cell (cell = atoms / sites); with several
/// mode sets (a disordered sample's configurations) their mean, and its standard error beside
/// `dos_stderr_per_thz_per_cell`. Bins with a mode within 1e-9 of the top frequency of an edge are not compared
/// (which side it falls is round-off).
/// </summary>
internal static class Histogram
{
    public static void Compare(Context x, string id, string kind, IReadOnlyList<IReadOnlyList<double>> modeSetsThz, double cells, string source)
    {
        var dos = x.Table("dos");
        var rows = dos.RowsOf(id).Where(r => dos.Text("curve", r) == "total").OrderBy(r => dos.Number("freq_thz", r)).ToList();
        if (rows.Count < 2)
        {
            x.Ledger.NoReference(kind + ".dos_histogram");
            return;
        }

        var centres = rows.Select(r => dos.Number("freq_thz", r)!.Value).ToArray();
        var width = (centres[^1] - centres[0]) / (centres.Length - 1);
        var lo = centres[0] - width / 2;
        var top = modeSetsThz.Max(s => s.Max(Math.Abs));
        var counts = new double[modeSetsThz.Count, centres.Length];
        var ambiguous = new bool[centres.Length];
        for (var c = 0; c < modeSetsThz.Count; c++)
        {
            foreach (var f in modeSetsThz[c])
            {
                var at = (Math.Max(f, 0) - lo) / width;
                var bin = Math.Clamp((int)Math.Floor(at), 0, centres.Length - 1);
                counts[c, bin] += 1 / cells / width;
                var edge = Math.Abs(at - Math.Round(at)) * width;
                if (f > 1e-9 * top && edge < 1e-9 * top)
                {
                    ambiguous[Math.Clamp((int)Math.Round(at) - 1, 0, centres.Length - 1)] = true;
                    ambiguous[Math.Clamp((int)Math.Round(at), 0, centres.Length - 1)] = true;
                }
            }
        }

        var n = modeSetsThz.Count;
        var worst = -1.0;
        int worstBin = -1;
        double worstRef = 0, worstEngine = 0, worstErr = 0, worstErrRef = 0;
        var scale = 1 / cells / width; // one mode in a bin
        for (var b = 0; b < centres.Length; b++)
        {
            if (ambiguous[b])
            {
                continue;
            }

            var mean = 0.0;
            for (var c = 0; c < n; c++)
            {
                mean += counts[c, b] / n;
            }

            var engine = dos.Number("dos_per_thz_per_cell", rows[b]) ?? 0;
            var diff = Math.Abs(engine - mean);
            if (diff > worst)
            {
                worst = diff;
                worstBin = b;
                worstRef = mean;
                worstEngine = engine;
            }

            if (n > 1)
            {
                var ss = 0.0;
                for (var c = 0; c < n; c++)
                {
                    ss += Math.Pow(counts[c, b] - mean, 2);
                }

                var err = Math.Sqrt(ss / (n - 1) / n);
                var engineErr = dos.Number("dos_stderr_per_thz_per_cell", rows[b]) ?? 0;
                if (Math.Abs(engineErr - err) > Math.Abs(worstErr - worstErrRef))
                {
                    (worstErr, worstErrRef) = (engineErr, err);
                }
            }
        }

        if (worstBin >= 0)
        {
            x.Add(kind + ".dos_histogram", $"worst of {centres.Length} bins: bin {worstBin} at {centres[worstBin]:G6} THz", worstEngine, worstRef, 1e-9 * scale + 1e-12 * Math.Abs(worstRef), source);
        }

        if (n > 1)
        {
            x.Add(kind + ".dos_stderr", "worst bin", worstErr, worstErrRef, 1e-9 * scale, source + "; spread over sqrt(configurations)");
        }
    }
}
