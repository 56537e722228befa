using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Tests.Support;
using Parquet.Serialization;

namespace LatticeSweep.Worker.Tests.JobFiles;

public sealed class CandidatesTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    private static string Job(string file, string axes = "") => Some.ChainJob(sweep: $"""
        [sweep.candidates]
        file = "{file}"
        keep = ["name"]
        columns = {"{"} mass_a = "model.sites.A.mass_amu", k = "model.springs[0].longitudinal_n_per_m", kind = "sample.cells" {"}"}
        {axes}
        """);

    [Fact]
    public void Csv_rows_become_points_with_typed_columns_and_the_kept_name()
    {
        _dir.Write("c.csv", "name,mass_a,k,kind\n\"first, the light\",12.5,30,8\nsecond,40,\"55.5\",16\n");
        var plan = Some.Load(_dir, Job("c.csv"));
        Assert.Equal(2, plan.Points.Length);
        var p = plan.Points[0];
        Assert.Equal("first, the light", p.Parameters["name"]);
        Assert.Equal(12.5, p.Parameters["sites_a_mass_amu"]);
        Assert.Equal(30.0, p.Parameters["springs_0_longitudinal_n_per_m"]);
        Assert.Equal(8L, p.Parameters["sample_cells"]);
        Assert.Equal(55.5, plan.Points[1].Parameters["springs_0_longitudinal_n_per_m"]);
        var request = LatticeSweep.Worker.Planning.PointBinder.Bind(plan, plan.Points[1]);
        Assert.Equal(40.0, request.Model.Sites[0].MassAmu);
        Assert.Equal(55.5, request.Model.ShellSprings[0].LongitudinalNPerM);
    }

    [Fact]
    public void Candidates_cross_the_other_axes_as_a_grid()
    {
        _dir.Write("c.csv", "name,mass_a,k,kind\na,12,30,8\nb,40,50,16\n");
        var plan = Some.Load(_dir, Job("c.csv", """
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            values = [1, 2, 3]
            """));
        Assert.Equal(6, plan.Points.Length);
        Assert.Equal(["a", "a", "a", "b", "b", "b"], plan.Points.Select(p => (string)p.Parameters["name"]));
        Assert.Equal([1.0, 2, 3, 1, 2, 3], plan.Points.Select(p => (double)p.Parameters["sites_b_mass_amu"]));
    }

    [Fact]
    public async Task Parquet_candidates_read_the_same_as_csv()
    {
        var rows = new[]
        {
            new CandidateRow { name = "a", mass_a = 12.0, k = 30.0, kind = 8 },
            new CandidateRow { name = "b", mass_a = 40.0, k = 50.0, kind = 16 },
        };
        var parquet = Path.Combine(_dir.Path, "c.parquet");
        await ParquetSerializer.SerializeAsync(rows, parquet);
        _dir.Write("c.csv", "name,mass_a,k,kind\na,12,30,8\nb,40,50,16\n");

        var fromParquet = Some.Load(_dir, Job("c.parquet"), "p.toml");
        var fromCsv = Some.Load(_dir, Job("c.csv"), "c.toml");
        Assert.Equal(fromCsv.Points.Select(p => p.PointId), fromParquet.Points.Select(p => p.PointId));
        Assert.Equal(16L, fromParquet.Points[1].Parameters["sample_cells"]);
        Assert.NotEqual(fromCsv.SpecHash, fromParquet.SpecHash);
    }

    [Fact]
    public async Task Bad_parquet_value_is_located_by_row_and_column()
    {
        var rows = new[]
        {
            new CandidateRow { name = "a", mass_a = 12.0, k = 30.0, kind = 8 },
            new CandidateRow { name = "b", mass_a = -4.0, k = 50.0, kind = 16 },
        };
        var parquet = Path.Combine(_dir.Path, "c.parquet");
        await ParquetSerializer.SerializeAsync(rows, parquet);
        var p = Assert.Single(Some.Fails(_dir, Job("c.parquet")).Problems);
        Assert.EndsWith("c.parquet", p.File, StringComparison.Ordinal);
        Assert.Equal(2, p.Line);
        Assert.Equal("mass_a", p.Key);
        Assert.Contains("must be > 0", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void A_file_that_is_not_parquet_is_bad_input()
    {
        _dir.Write("c.parquet", "name,mass_a\n");
        var p = Assert.Single(Some.Fails(_dir, Job("c.parquet")).Problems);
        Assert.Contains("not a readable Parquet file", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Unclosed_quote_in_csv_is_located()
    {
        _dir.Write("c.csv", "name,mass_a,k,kind\n\"open,12,30,8\n");
        var p = Assert.Single(Some.Fails(_dir, Job("c.csv")).Problems);
        Assert.Equal(2, p.Line);
        Assert.Contains("never closed", p.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Empty_candidates_file_is_bad_input()
    {
        _dir.Write("c.csv", "");
        Assert.Contains("empty", Assert.Single(Some.Fails(_dir, Job("c.csv")).Problems).Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Unsupported_extension_is_bad_input()
    {
        _dir.Write("c.xlsx", "x");
        var p = Assert.Single(Some.Fails(_dir, Job("c.xlsx")).Problems);
        Assert.Equal("sweep.candidates.file", p.Key);
    }

    public sealed class CandidateRow
    {
#pragma warning disable IDE1006, CA1707 // column names as they appear in the file
        public string name { get; set; } = "";
        public double mass_a { get; set; }
        public double k { get; set; }
        public int kind { get; set; }
#pragma warning restore IDE1006, CA1707
    }
}
