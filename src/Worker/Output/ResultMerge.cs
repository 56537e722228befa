using System.Diagnostics;
using LatticeSweep.Worker.Catalog;
using Serilog;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// Merges a finished sweep's part files (every table, see <see cref="TableMerger"/>): at the end of
/// <c>run</c>, <c>resume</c> and <c>work</c>, and on demand with <c>latsweep merge</c>. A merge that
/// fails leaves the parts as they were (the results are complete either way) and says how to retry.
/// </summary>
public static class ResultMerge
{
    /// <summary>Merges; returns false (after logging why) when it could not.</summary>
    public static bool TryRun(SweepRecord sweep, ILogger log, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        ArgumentNullException.ThrowIfNull(log);
        if (!Directory.Exists(sweep.OutputFolder))
        {
            return true;
        }

        var clock = Stopwatch.StartNew();
        try
        {
            IReadOnlyList<TableMerger.Outcome> outcomes;
            using (Queue.StageTimings.MeasureAlone("merge part files"))
            {
                outcomes = TableMerger.MergeSweepAsync(sweep.OutputFolder, sweep.Tables, new ResultSchemas(sweep.Axes).ColumnsOf(TableNames.Points), ct).GetAwaiter().GetResult();
            }

            var parts = outcomes.Sum(o => o.PartsMerged);
            if (parts > 0)
            {
                // A table is either rewritten (sorted into one file, or files of ~64 MiB) or keeps its files by a second name
                // (MergedLayout.TakenAsTheyAre: one file with rows, or a few files of 64 MiB and more).
                var asTheyWere = outcomes.Count(o => o.PartsMerged > 0 && o.TakenAsTheyWere);
                var tables = outcomes.Count(o => o.PartsMerged > 0);
                log.Information("Sweep {SweepId}: merged {Parts} part files into {Files} files of {Tables} tables ({Rewritten} rewritten sorted by point, {AsTheyWere} kept as they were: one file with rows, or files of 64 MiB and more) in {Seconds:F1} s",
                    sweep.SweepId, parts, outcomes.Sum(o => o.FilesWritten), tables, tables - asTheyWere, asTheyWere, clock.Elapsed.TotalSeconds);
            }

            return true;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or InvalidDataException or Parquet.ParquetException)
        {
            log.Warning("Sweep {SweepId}: its part files could not be merged ({Error}); the results are complete as they are; 'latsweep merge {SweepId}' tries again",
                sweep.SweepId, ex.Message, sweep.SweepId);
            return false;
        }
    }
}
