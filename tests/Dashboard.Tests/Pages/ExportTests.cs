using System.Globalization;
using System.Text;
using LatticeSweep.Dashboard.Tests.Support;

namespace LatticeSweep.Dashboard.Tests.Pages;

/// <summary>
/// The filtered points table as CSV (units in the header) and as Parquet (units in the file's
/// metadata), each read back by DuckDB and compared with DuckDB's own reading of the dataset.
/// </summary>
[Collection(ScreeningCollection.Name)]
public sealed class ExportTests
{
    private readonly ScreeningFixture _f;
    private readonly TempFolder _temp = new();

    public ExportTests(ScreeningFixture f)
    {
        _f = f;
    }

    [Fact]
    public async Task Parquet_export_has_the_filtered_rows_every_column_with_its_type_and_the_units_in_its_metadata()
    {
        var id = _f.UnstableId;
        using var http = _f.Server.Client();
        using var response = await http.GetAsync($"/api/sweeps/{id}/export.parquet?stable=1&sort=max_freq_thz&dir=desc");
        response.EnsureSuccessStatusCode();
        Assert.Equal("application/vnd.apache.parquet", response.Content.Headers.ContentType!.MediaType);
        Assert.Equal($"{id}-points-filtered.parquet", response.Content.Headers.ContentDisposition!.FileNameStar ?? response.Content.Headers.ContentDisposition.FileName);
        var file = Path.Combine(_temp.Path, "export.parquet");
        await File.WriteAllBytesAsync(file, await response.Content.ReadAsByteArrayAsync());

        using var duck = new DuckDb();
        var source = DuckDb.Table(_f.Folder(id), "points");
        var exported = $"read_parquet({DuckDb.Text(file)})";
        // Same columns with the same types as the dataset.
        Assert.Equal(duck.Rows($"DESCRIBE SELECT * FROM {source}").Select(r => ((string)r[0]!, (string)r[1]!)),
            duck.Rows($"DESCRIBE SELECT * FROM {exported}").Select(r => ((string)r[0]!, (string)r[1]!)));
        // Same rows, in the asked order; every value equal (EXCEPT finds none in either direction). An
        // undefined number is an empty cell in the export (datasets from before that rule hold NaN there).
        Assert.Equal(duck.Rows($"SELECT point_id FROM {source} WHERE stable ORDER BY max_freq_thz DESC, point_index").Select(r => r[0]),
            duck.Rows($"SELECT point_id FROM {exported}").Select(r => r[0]));
        var doubles = duck.Rows($"SELECT column_name FROM (DESCRIBE SELECT * FROM {source}) WHERE column_type = 'DOUBLE'").Select(r => (string)r[0]!).ToList();
        var wanted = $"SELECT * REPLACE ({string.Join(", ", doubles.Select(c => $"CASE WHEN isnan({c}) THEN NULL ELSE {c} END AS {c}"))}) FROM {source} WHERE stable";
        Assert.Equal(0L, duck.Scalar($"SELECT COUNT(*) FROM ({wanted} EXCEPT SELECT * FROM {exported})"));
        Assert.Equal(0L, duck.Scalar($"SELECT COUNT(*) FROM (SELECT * FROM {exported} EXCEPT {wanted})"));

        // Units and the filter in the file's metadata.
        var meta = duck.Rows($"SELECT decode(key), decode(value) FROM parquet_kv_metadata({DuckDb.Text(file)})").ToDictionary(r => (string)r[0]!, r => (string)r[1]!);
        var units = System.Text.Json.JsonSerializer.Deserialize<Dictionary<string, string>>(meta["latticesweep.units"])!;
        Assert.Equal("THz", units["max_freq_thz"]);
        Assert.Equal("J/(mol K)", units["cv_j_per_mol_k"]);
        Assert.Equal("N/m", units["springs_0_transverse_n_per_m"]);
        Assert.Equal(id, meta["latticesweep.sweep_id"]);
        Assert.Equal("?stable=1", meta["latticesweep.filter"]);
    }

    [Fact]
    public async Task Csv_export_has_the_units_in_its_header_and_the_exact_values()
    {
        var id = _f.QuickstartId;
        using var http = _f.Server.Client();
        using var response = await http.GetAsync($"/api/sweeps/{id}/export.csv?is=sample_kind:bulk");
        response.EnsureSuccessStatusCode();
        Assert.Equal("text/csv", response.Content.Headers.ContentType!.MediaType);
        var text = Encoding.UTF8.GetString(await response.Content.ReadAsByteArrayAsync());
        var header = text[..text.IndexOf('\n', StringComparison.Ordinal)].Split(',');
        Assert.Contains("max_freq_thz [THz]", header);
        Assert.Contains("cv_j_per_mol_k [J/(mol K)]", header);
        Assert.Contains("sites_b_mass_amu [amu]", header);
        Assert.Contains("point_id", header);
        Assert.Contains("stable", header);
        Assert.DoesNotContain(header, h => h.EndsWith("[1]", StringComparison.Ordinal));

        var file = Path.Combine(_temp.Path, "export.csv");
        await File.WriteAllTextAsync(file, text);
        using var duck = new DuckDb();
        var source = DuckDb.Table(_f.Folder(id), "points");
        var csv = $"read_csv({DuckDb.Text(file)}, header = true)";
        var expected = duck.Rows($"SELECT point_id, max_freq_thz, cv_j_per_mol_k, stable, started_at FROM {source} WHERE sample_kind = 'bulk' ORDER BY point_index");
        var read = duck.Rows($"SELECT point_id, \"max_freq_thz [THz]\", \"cv_j_per_mol_k [J/(mol K)]\", stable, \"started_at [UTC]\" FROM {csv}");
        Assert.Equal(12, expected.Count);
        Assert.Equal(expected.Count, read.Count);
        foreach (var (want, got) in expected.Zip(read))
        {
            Assert.Equal(want[0], got[0]);
            Assert.Equal((double)want[1]!, Convert.ToDouble(got[1], CultureInfo.InvariantCulture));
            Assert.Equal((double)want[2]!, Convert.ToDouble(got[2], CultureInfo.InvariantCulture));
            Assert.Equal(want[3], got[3]);
            Assert.Equal(Utc(want[4]), Utc(got[4]));
        }

        // Plain names when asked, for tools that want them.
        var plain = await http.GetStringAsync($"/api/sweeps/{id}/export.csv?header=names");
        Assert.StartsWith("point_id,", plain, StringComparison.Ordinal);
        Assert.DoesNotContain("[THz]", plain[..plain.IndexOf('\n', StringComparison.Ordinal)], StringComparison.Ordinal);
        Assert.Equal(25, plain.TrimEnd('\n').Split('\n').Length);
    }

    private static DateTime Utc(object? value) => value switch
    {
        DateTimeOffset t => t.UtcDateTime,
        DateTime t => t.Kind == DateTimeKind.Local ? t.ToUniversalTime() : DateTime.SpecifyKind(t, DateTimeKind.Utc),
        string s => DateTimeOffset.Parse(s, CultureInfo.InvariantCulture).UtcDateTime,
        _ => throw new Xunit.Sdk.XunitException($"not a time: {value}"),
    };

    [Fact]
    public async Task A_text_cell_with_commas_quotes_and_line_breaks_survives_the_csv()
    {
        // Failed points carry their reason: several words, sometimes punctuation; DuckDB must read the same text back.
        using var store = DemoStore.Create();
        var id = await store.AddAsync("springs-off.toml", DemoJobs.Failures, DemoProgress.Finished);
        await using var server = await DashboardServer.StartAsync(store);
        using var http = server.Client();
        var file = Path.Combine(_temp.Path, "failed.csv");
        await File.WriteAllTextAsync(file, await http.GetStringAsync($"/api/sweeps/{id}/export.csv?header=names"));
        using var duck = new DuckDb();
        var expected = duck.Rows($"SELECT point_id, error FROM {DuckDb.Table(Path.Combine(store.OutputRoot, id), "points")} ORDER BY point_index");
        var read = duck.Rows($"SELECT point_id, error FROM read_csv({DuckDb.Text(file)}, header = true, quote = '\"', escape = '\"')");
        Assert.Contains(expected, r => r[1] is string);
        Assert.Equal(expected.Select(r => (r[0], r[1])), read.Select(r => (r[0], r[1])));
    }
}
