using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Worker.Tests.Catalog;

public sealed class FailureTextTests
{
    public static TheoryData<FailureOrigin> Origins => new()
    {
        new FailureOrigin(FailureOriginKind.SweptValue, [new OriginKey("model.sites.B.position[0]", "/tmp/a b/job [1].toml:7:1")]),
        new FailureOrigin(FailureOriginKind.SweptValue, [new OriginKey("model.springs[0].transverse_n_per_m", "/j.toml:15:1"), new OriginKey("model.sites[1].mass_amu", "/j.toml:3:9")]),
        new FailureOrigin(FailureOriginKind.SweptTogether, [new OriginKey("sample.cells", "/j.toml:2:1"), new OriginKey("model.constant_nm", "/j.toml:4:1")]),
        new FailureOrigin(FailureOriginKind.SweptTogether, [new OriginKey("sample.cells", "/odd: name at 3:4/j.toml:2:1"), new OriginKey("model.constant_nm", "/odd: name at 3:4/j.toml:4:1")]),
        new FailureOrigin(FailureOriginKind.SweptValue, [new OriginKey("sample.cells", "/a.toml:2:1"), new OriginKey("model.constant_nm", "/b.toml:4:1")]),
        new FailureOrigin(FailureOriginKind.SweptValue, [new OriginKey("model.sites.B.mass_amu", "/jobs/candidates/x.csv:17", "mass_b")]),
        new FailureOrigin(FailureOriginKind.SweptValue, [new OriginKey("model.sites.B.mass_amu", "/odd, column x:3/x.csv:17", "mass (b)"), new OriginKey("model.constant_nm", "/odd, column x:3/x.csv:17", "a_nm"), new OriginKey("sample.cells", "/j.toml:20:1")]),
        new FailureOrigin(FailureOriginKind.SweptTogether, [new OriginKey("model.sites.B.mass_amu", "/c/x.parquet row 4", "mass_b"), new OriginKey("model.constant_nm", "/c/x.parquet row 4", "a_nm")]),
        FailureOrigin.JobFile,
        FailureOrigin.Untraced,
        FailureOrigin.Solver,
    };

    [Theory]
    [MemberData(nameof(Origins))]
    public void A_composed_text_splits_back_into_its_reason_and_origin(FailureOrigin origin)
    {
        const string reason = "model.sites[1].position: site 'B' sits on site 'A' [really] (same position)";
        var (back, parsed) = FailureText.Split(FailureText.Compose(reason, origin));
        Assert.Equal(reason, back);
        Assert.NotNull(parsed);
        Assert.Equal(origin.Kind, parsed.Kind);
        Assert.Equal(origin.Keys.ToArray(), parsed.Keys.ToArray());
        Assert.Equal(origin, parsed);
    }

    [Fact]
    public void Several_keys_in_one_file_say_the_file_once()
    {
        const string file = "/home/me/a/very/long/path/to/the/screening/job.toml";
        var together = new FailureOrigin(FailureOriginKind.SweptTogether, [new OriginKey("a", file + ":7:1"), new OriginKey("b", file + ":9:1")]);
        Assert.Equal($"r [swept together in {file}: a at 7:1; b at 9:1]", FailureText.Compose("r", together));
        Assert.Equal($"the swept values together (no one alone) of a, values at line 7:1; b, values at line 9:1, in {file}", together.Describe());
        var each = together with { Kind = FailureOriginKind.SweptValue };
        Assert.Equal($"r [swept in {file}: a at 7:1; b at 9:1]", FailureText.Compose("r", each));

        // One key keeps FILE:LINE:COL, the form editors open at the line; keys of two files each name theirs.
        Assert.Equal($"r [swept: a at {file}:7:1]", FailureText.Compose("r", new FailureOrigin(FailureOriginKind.SweptValue, [new OriginKey("a", file + ":7:1")])));
        Assert.Equal("r [swept: a at /x.toml:7:1; b at /y.toml:9:1]", FailureText.Compose("r", new FailureOrigin(FailureOriginKind.SweptValue, [new OriginKey("a", "/x.toml:7:1"), new OriginKey("b", "/y.toml:9:1")])));
    }

    [Fact]
    public void A_failing_candidate_is_named_by_its_row_in_the_candidates_file_and_its_column()
    {
        var one = new FailureOrigin(FailureOriginKind.SweptValue, [new OriginKey("model.sites.B.mass_amu", "jobs/candidates/x.csv:17", "mass_b")]);
        Assert.Equal("r [candidate in jobs/candidates/x.csv:17, column mass_b (model.sites.B.mass_amu)]", FailureText.Compose("r", one));
        Assert.Equal("the candidate in jobs/candidates/x.csv:17: column mass_b (model.sites.B.mass_amu)", one.Describe());

        // Several columns of the row: the row said once; a swept key of the job file keeps its own place.
        var two = new FailureOrigin(FailureOriginKind.SweptValue, [
            new OriginKey("model.sites.B.mass_amu", "/c/x.csv:17", "mass_b"),
            new OriginKey("sample.cells", "/j.toml:20:1"),
        ]);
        Assert.Equal("r [candidate in /c/x.csv:17, column mass_b (model.sites.B.mass_amu); sample.cells at /j.toml:20:1]", FailureText.Compose("r", two));
        Assert.Equal("the candidate in /c/x.csv:17: each of column mass_b (model.sites.B.mass_amu); the swept sample.cells, values at /j.toml:20:1", two.Describe());
        var together = new FailureOrigin(FailureOriginKind.SweptTogether, [new OriginKey("model.sites.B.mass_amu", "/c/x.parquet row 4", "mass_b"), new OriginKey("model.constant_nm", "/c/x.parquet row 4", "a_nm")]);
        Assert.Equal("r [candidate together in /c/x.parquet row 4, column mass_b (model.sites.B.mass_amu); column a_nm (model.constant_nm)]", FailureText.Compose("r", together));
        Assert.StartsWith("the values together (no one alone) of the candidate in /c/x.parquet row 4: ", together.Describe(), StringComparison.Ordinal);
    }

    [Fact]
    public void A_text_written_before_candidates_named_their_row_still_reads_back()
    {
        var (reason, origin) = FailureText.Split("r [swept in /j.toml: model.sites.B.mass_amu at 8:1; sample.cells at 20:1]");
        Assert.Equal("r", reason);
        Assert.Equal(new FailureOrigin(FailureOriginKind.SweptValue, [new OriginKey("model.sites.B.mass_amu", "/j.toml:8:1"), new OriginKey("sample.cells", "/j.toml:20:1")]), origin);
        Assert.Null(origin!.CandidateRow);
    }

    [Fact]
    public void A_text_written_before_the_file_was_said_once_still_reads_back()
    {
        var (reason, origin) = FailureText.Split("r [swept together: a at /j.toml:7:1; b at /j.toml:9:1]");
        Assert.Equal("r", reason);
        Assert.Equal(new FailureOrigin(FailureOriginKind.SweptTogether, [new OriginKey("a", "/j.toml:7:1"), new OriginKey("b", "/j.toml:9:1")]), origin);
    }

    [Theory]
    [InlineData("results could not be written to /out: the disk is full (No space left on device) (run resume once the folder is writable)")]
    [InlineData("mass must be > 0")]
    [InlineData("a reason ending in a bracket [of its own]")]
    [InlineData("")]
    public void A_text_without_an_origin_is_its_own_reason(string error)
    {
        var (reason, origin) = FailureText.Split(error);
        Assert.Equal(error, reason);
        Assert.Null(origin);
    }

    [Fact]
    public void A_group_shows_few_values_one_by_one_and_many_as_a_range()
    {
        var few = new FailingValues("springs_0_transverse_n_per_m", "model.springs[0].transverse_n_per_m", 2, [0.0, -2.0], -2, 0, 3);
        Assert.Equal("springs_0_transverse_n_per_m = 0, -2 (2 of 3 values)", few.ToString());
        var many = new FailingValues("mass_amu", "model.sites.A.mass_amu", 40, [1.0, 2.0, 3.0, 4.0, 5.0], 0.5, 9.5, 200);
        Assert.Equal("mass_amu from 0.5 to 9.5 (40 of 200 values)", many.ToString());
        var text = new FailingValues("kind", "sample.kind", 6, ["a", "b", "c", "d", "e"], null, null, 0);
        Assert.Equal("kind = a, b, c, d, e, ... (6 values)", text.ToString());
    }
}
