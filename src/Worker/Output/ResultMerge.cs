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
                var asTheyWere = outcomes.Count(o => o.PartsMerged > 0 && o.TakenAsTheyWere);
                log.Information("Sweep {SweepId}: merged {Parts} part files into {Files} files of {Tables} tables ({AsTheyWere} of the tables by taking their files as they were) in {Seconds:F1} s",
                    sweep.SweepId, parts, outcomes.Sum(o => o.FilesWritten), outcomes.Count(o => o.PartsMerged > 0), asTheyWere, clock.Elapsed.TotalSeconds);
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
