using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>Column facts from footers (a merged file's, or a running sweep's parts summed) against a scan of every row.</summary>
internal static class SummaryFacts
{
    /// <summary>
    /// Per column of <paramref name="scanned"/>: the count with a value, the finite numbers and their range, and the
    /// distinct values in row order (up to <see cref="ColumnSummary.DistinctKept"/>; times are counted only) as
    /// <paramref name="summary"/> gives them.
    /// </summary>
    public static void AssertColumnsAgreeWithEveryRow(TableSummary summary, ResultTable scanned)
    {
        foreach (var column in scanned.Columns)
        {
            var cells = scanned.Cells(scanned.IndexOf(column.Name));
            var facts = summary.Of(column.Name)!;
            Assert.Equal(Enumerable.Range(0, scanned.Count).Count(cells.HasValue), facts.Count);
            var finite = scanned.Numbers(column.Name).OfType<double>().Where(double.IsFinite).ToList();
            Assert.Equal(finite.Count, facts.Finite);
            if (finite.Count > 0)
            {
                Assert.Equal(finite.Min(), facts.Min);
                Assert.Equal(finite.Max(), facts.Max);
            }

            // Distinct values with a value, in row order, boxed as the cells are.
            var seen = new HashSet<CellKey>();
            var distinct = Enumerable.Range(0, scanned.Count).Where(r => cells.HasValue(r) && seen.Add(cells.Key(r))).Select(cells.Cell).ToList();
            if (column.ClrType == typeof(DateTime) || column.ClrType == typeof(DateTimeOffset))
            {
                // Times are counted only: no values listed, so every use of their values scans.
                Assert.True(facts.More);
                Assert.Null(summary.DistinctCells(column.Name));
                continue;
            }

            Assert.Equal(distinct.Take(ColumnSummary.DistinctKept).ToArray(), facts.Distinct.ToArray());
            Assert.Equal(distinct.Count > ColumnSummary.DistinctKept, facts.More);
            if (!facts.More)
            {
                Assert.Equal(distinct.Count + (facts.Count < scanned.Count ? 1 : 0), summary.DistinctCells(column.Name));
            }
        }
    }
}
