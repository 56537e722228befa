using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// Writes all part files of one chunk. A chunk's parts are its commit: the catalog marks the
/// chunk's points finished only after this returns, so a chunk interrupted before that is run
/// again as a whole and its parts are replaced, never appended to.
/// </summary>
/// <remarks>
/// Every table's part is first written to a temporary file; only when all of them are on disk are
/// they renamed into place, under a shared hold of the sweep's <see cref="OutputLock"/> (the merge
/// takes it exclusively). A chunk whose rows were merged already keeps them (<see cref="MergedLayout"/>). A write that fails (disk full, folder read-only) so leaves every table
/// as it was: no part of this run appears, and parts from an earlier run of the chunk are not touched.
/// </remarks>
public static class ChunkOutputWriter
{
    public static async Task WriteAsync(SweepRecord sweep, OutputSelection outputs, string chunkId, IReadOnlyList<PointOutcome> outcomes, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        var schemas = new ResultSchemas(sweep.Axes);
        var metadata = new Dictionary<string, string>
        {
            ["latticesweep.sweep_id"] = sweep.SweepId,
            ["latticesweep.chunk_id"] = chunkId,
            ["latticesweep.engine_version"] = outcomes.Count > 0 ? outcomes[0].EngineVersion : sweep.EngineVersion,
        };
        var prepared = new List<PreparedPart>();
        // The rows of each part, for WrittenParts when this process merges the sweep from them (else nothing is kept).
        var keep = WrittenParts.Keeps(sweep.SweepId, sweep.ChunkCount);
        var written = new Dictionary<PreparedPart, TableRows>();
        try
        {
            var rowed = ChunkTables.Rowed(outcomes);
            using (Queue.StageTimings.Measure("parquet: write parts"))
            {
                // points/ first, a column at a time with its facts (its own column summary, as a merged file carries it, and its
                // first rows in plan order: a running sweep's page sums the parts' footers instead of reading their rows); its
                // columns are held together only when they are kept.
                var points = schemas.Points.ColumnsOf(rowed);
                var pointsWritten = keep ? new Array?[points.Columns.Count] : null;
                prepared.Add(await ParquetPartWriter.PrepareWithFactsAsync(SweepFolder.Table(sweep.OutputFolder, points.Table), chunkId, points,
                    new Dictionary<string, string>(metadata) { ["latticesweep.table"] = points.Table }, ct, pointsWritten).ConfigureAwait(false));
                if (pointsWritten is not null && Array.TrueForAll(pointsWritten, v => v is not null))
                {
                    written[prepared[^1]] = new TableRows(points.Table, points.Columns, points.RowCount, pointsWritten!);
                }
            }

            IReadOnlyList<TableRows> tables;
            using (Queue.StageTimings.Measure("rows: build"))
            {
                tables = ChunkTables.OtherTables(schemas, outputs, rowed);
            }

            foreach (var rows in tables)
            {
                using var writing = Queue.StageTimings.Measure("parquet: write parts");
                // A table with no rows in this chunk still gets an empty part: it carries the schema, so
                // every listed table folder exists and a reader's glob over it works (and a stale part
                // from an earlier run of the chunk is replaced).
                var folder = SweepFolder.Table(sweep.OutputFolder, rows.Table);
                var meta = new Dictionary<string, string>(metadata) { ["latticesweep.table"] = rows.Table };
                prepared.Add(await ParquetPartWriter.PrepareAsync(folder, chunkId, rows, meta, ct).ConfigureAwait(false));
                if (keep)
                {
                    written[prepared[^1]] = rows;
                }
            }
        }
        catch
        {
            foreach (var part in prepared)
            {
                part.Discard();
            }

            throw;
        }

        // Shared hold of the sweep's output lock: a merge (exclusive) never swaps a table folder
        // while parts are renamed into it.
        using var hold = OutputLock.Shared(sweep.OutputFolder);
        for (var i = 0; i < prepared.Count; i++)
        {
            try
            {
                using var committing = Queue.StageTimings.Measure("parquet: rename parts");
                var tableFolder = Path.GetDirectoryName(prepared[i].FinalPath)!;
                if (MergedLayout.MergedFileOfChunk(tableFolder, chunkId) is not null)
                {
                    // This chunk ran before and its rows are in a merged file already (a late second
                    // delivery, or a resume after a crash between the parts and the catalog): keep those.
                    // A merged file deleted since (LostResults) keeps nothing: the new part goes in.
                    prepared[i].Discard();
                    continue;
                }

                // The file as written, taken before the rename (which keeps it): the merge of this process
                // takes the rows from memory only while the part is still this file (WrittenParts).
                var kept = written.TryGetValue(prepared[i], out var rows) ? rows : null;
                var identity = kept is not null ? WrittenParts.IdentityOf(prepared[i].TemporaryPath) : default;
                prepared[i].Commit();
                if (kept is not null)
                {
                    WrittenParts.Keep(sweep.SweepId, prepared[i].FinalPath, identity, kept);
                }
            }
            catch
            {
                // The run is repeated as a whole; leave no temporary files behind.
                foreach (var rest in prepared.Skip(i))
                {
                    rest.Discard();
                }

                throw;
            }
        }

        // Every part is in place: each table's writing folder goes once it is empty (another chunk's part may still be in one).
        foreach (var tableFolder in prepared.Select(p => Path.GetDirectoryName(p.FinalPath)!).Distinct(StringComparer.Ordinal))
        {
            ParquetPartWriter.RemoveWritingFolderIfEmpty(tableFolder);
        }
    }

    /// <summary>The output selection that a sweep's table list stands for.</summary>
    public static OutputSelection OutputsOf(SweepRecord sweep)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        var t = sweep.Tables;
        return new OutputSelection(
            Dos: t.Contains(TableNames.Dos),
            Thermal: t.Contains(TableNames.Thermal),
            Dispersion: t.Contains(TableNames.Dispersion),
            Modes: t.Contains(TableNames.Modes),
            Displacements: t.Contains(TableNames.MeanSquareDisplacements) || t.Contains(TableNames.FormerDisplacements),
            CumulativeKappa: t.Contains(TableNames.CumulativeKappa),
            Layers: t.Contains(TableNames.Layers),
            LayerDos: t.Contains(TableNames.LayerDos),
            Expansion: t.Contains(TableNames.Expansion));
    }
}
