using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Commands;

namespace LatticeSweep.Worker.Tests.Commands;

/// <summary>
/// Failing candidates that fail alike (one group each in the store) are printed by run and status as one
/// reason with the candidates' lines and their total; groups of other reasons, files or columns stay apart.
/// </summary>
public sealed class CandidateFailuresTests
{
    private const string NoTransverse = "model.springs[0].transverse_n_per_m: a chain needs a transverse spring for its sideways motion";

    private static FailureGroup Candidate(int line, long count = 2, string file = "/data/c.csv", string column = "k_t", string reason = NoTransverse) =>
        new(FailureKind.Model, $"{reason} [candidate in {file}:{line}, column {column} (model.springs[0].transverse_n_per_m)]", count, [$"p{line:D3}"]);

    private static string Printed(IEnumerable<FailureGroup> groups)
    {
        using var o = new StringWriter { NewLine = "\n" };
        foreach (var entry in FailureGroupText.Entries(groups))
        {
            FailureGroupText.Write(o, entry, "  ");
        }

        return o.ToString();
    }

    [Fact]
    public void Twenty_failing_candidates_of_one_reason_are_one_entry_with_their_lines_and_total()
    {
        // Largest first, as the catalog gives them; lines not in order (a candidate of 3 points first).
        var groups = new List<FailureGroup> { Candidate(9, count: 3) };
        groups.AddRange(Enumerable.Range(2, 21).Where(l => l != 9).Select(l => Candidate(l)));
        groups.Add(new FailureGroup(FailureKind.Io, "disk full", 1, ["p999"]));

        var text = Printed(groups);
        Assert.Equal(
            $"  43 x model: {NoTransverse}\n" +
            "      from: the candidates in /data/c.csv:2, :3, :4 and 18 more (21 candidates): column k_t (model.springs[0].transverse_n_per_m)\n" +
            "      e.g. points p002, p003, p004\n" +
            "  1 x io: disk full\n" +
            "      e.g. point p999\n", text);
        Assert.Single(text.Split('\n'), l => l.Contains(NoTransverse, StringComparison.Ordinal));
    }

    [Fact]
    public void Candidates_of_other_reasons_files_or_columns_stay_apart_and_one_candidate_reads_as_before()
    {
        var groups = new[]
        {
            Candidate(3), Candidate(5),
            Candidate(4, reason: "model.sites[1].position: site 'B' sits on site 'A'"),
            Candidate(6, file: "/data/other.csv"),
            Candidate(7, column: "k_t2"),
        };

        var text = Printed(groups);
        Assert.Contains("  4 x model: " + NoTransverse + "\n      from: the candidates in /data/c.csv:3, :5: column k_t (model.springs[0].transverse_n_per_m)\n", text, StringComparison.Ordinal);
        Assert.Contains("      from: the candidate in /data/c.csv:4: column k_t (model.springs[0].transverse_n_per_m)\n", text, StringComparison.Ordinal);
        Assert.Contains("      from: the candidate in /data/other.csv:6: column k_t (model.springs[0].transverse_n_per_m)\n", text, StringComparison.Ordinal);
        Assert.Contains("      from: the candidate in /data/c.csv:7: column k_t2 (model.springs[0].transverse_n_per_m)\n", text, StringComparison.Ordinal);
        Assert.Equal(4, text.Split('\n').Count(l => l.StartsWith("  ", StringComparison.Ordinal) && !l.StartsWith("    ", StringComparison.Ordinal)));
    }

    [Fact]
    public void Rows_of_a_parquet_candidates_file_are_named_by_row()
    {
        var groups = Enumerable.Range(1, 5).Select(r => new FailureGroup(FailureKind.Model,
            $"{NoTransverse} [candidate in /data/c.parquet row {r}, column k_t (model.springs[0].transverse_n_per_m)]", 1, [$"p{r}"])).ToList();
        Assert.Contains("from: the candidates in /data/c.parquet row 1, row 2, row 3 and 2 more (5 candidates): column k_t", Printed(groups), StringComparison.Ordinal);
    }
}
