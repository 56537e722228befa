using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Text.Json.Nodes;
using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// Writes <c>sweep.json</c>: the spec as given, the expanded axes, every table's columns with type
/// and unit, the engine version, timestamps and counts. Rewritten (atomically, by rename) whenever
/// the sweep's state changes; any worker may write it, all of them write the same shape from the catalog.
/// </summary>
public static class SweepManifest
{
    public const int FormatVersion = 1;

    public static void Write(SweepRecord sweep, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        Directory.CreateDirectory(sweep.OutputFolder);
        var path = SweepFolder.Manifest(sweep.OutputFolder);
        var temporary = Path.Combine(sweep.OutputFolder, $".sweep.{Guid.NewGuid():N}.tmp");
        try
        {
            File.WriteAllText(temporary, Build(sweep, now).ToJsonString(new JsonSerializerOptions { WriteIndented = true }) + "\n", new UTF8Encoding(false));
            File.Move(temporary, path, overwrite: true);
        }
        catch
        {
            try
            {
                File.Delete(temporary);
            }
            catch (IOException)
            {
            }

            throw;
        }
    }

    public static JsonObject Build(SweepRecord sweep, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(sweep);
        var schemas = new ResultSchemas(sweep.Axes);
        var tables = new JsonObject();
        foreach (var table in sweep.Tables)
        {
            var columns = new JsonArray();
            foreach (var c in schemas.ColumnsOf(table))
            {
                columns.Add(new JsonObject
                {
                    ["name"] = c.Name,
                    ["type"] = c.Type.ToString().ToLowerInvariant(),
                    ["unit"] = c.Unit,
                    ["description"] = c.Description,
                });
            }

            tables[table] = new JsonObject
            {
                ["folder"] = table + "/",
                ["files"] = "part-<chunk id>.parquet",
                ["columns"] = columns,
            };
        }

        var axes = JsonNode.Parse(CatalogJson.WriteAxes(sweep.Axes))!;
        return new JsonObject
        {
            ["format_version"] = FormatVersion,
            ["sweep_id"] = sweep.SweepId,
            ["name"] = sweep.Name,
            ["description"] = sweep.Description,
            ["state"] = sweep.State.ToString().ToLowerInvariant(),
            ["engine_version"] = sweep.EngineVersion,
            ["spec_hash"] = sweep.SpecHash,
            ["source_path"] = sweep.SourcePath,
            ["created_at"] = Time(sweep.CreatedAt),
            ["started_at"] = Time(sweep.StartedAt),
            ["finished_at"] = Time(sweep.FinishedAt),
            ["written_at"] = Time(now),
            ["counts"] = new JsonObject
            {
                ["points"] = sweep.Counts.Total,
                ["chunks"] = sweep.ChunkCount,
                ["waiting"] = sweep.Counts.Waiting,
                ["running"] = sweep.Counts.Running,
                ["done"] = sweep.Counts.Done,
                ["unstable"] = sweep.Counts.Unstable,
                ["failed"] = sweep.Counts.Failed,
                ["cancelled"] = sweep.Counts.Cancelled,
            },
            ["axes"] = axes,
            ["tables"] = tables,
            ["units_metadata_key"] = ParquetPartWriter.UnitsKey,
            ["spec"] = sweep.SpecText,
            ["caution"] = "Model estimates from a masses-and-springs lattice model; check against measurements before relying on them for design decisions.",
        };
    }

    private static string? Time(DateTimeOffset? t) => t?.UtcDateTime.ToString("yyyy-MM-dd'T'HH:mm:ss.fff'Z'", CultureInfo.InvariantCulture);
}
