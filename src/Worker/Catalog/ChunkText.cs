using System.Buffers;
using System.Text.Json;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// The text of a pending chunk's points (<c>latsweep_chunks.points_json</c>, see <see cref="CatalogSchema"/>):
/// <c>[{"names": [name, ...]}, [point_id, point_index, [value, ...]], ...]</c>, the parameters' names once
/// per chunk and each point's values in their order (a point whose parameters have other names keeps
/// them as an object: <c>[point_id, point_index, {name: value, ...}]</c>). Stores written before this
/// hold <c>[[point_id, point_index, {parameters}], ...]</c>, which every reader still takes. The names
/// were ~60 of a point's ~110 bytes at 10^6 points; the values are the same text as before, so a
/// point's parameters read back byte for byte as <see cref="CatalogJson.WriteParameters(IReadOnlyDictionary{string, object})"/> wrote them.
/// </summary>
internal static class ChunkText
{
    /// <summary>The header's key for the parameters' names.</summary>
    public const string NamesKey = "names";

    /// <summary>Writes one chunk's text: <see cref="Start"/>, <see cref="Add"/> for each point in plan order, <see cref="End"/>.</summary>
    public sealed class Writer
    {
        private readonly List<string> _names = [];
        private bool _started;

        /// <summary>The plan's shared column array when the chunk's first point came from a plan: its points then have the names by reference.</summary>
        private string[]? _columns;

        public void Start(Utf8JsonWriter w)
        {
            ArgumentNullException.ThrowIfNull(w);
            w.WriteStartArray();
            _names.Clear();
            _started = false;
            _columns = null;
        }

        public void Add(Utf8JsonWriter w, string pointId, long index, IReadOnlyDictionary<string, object> parameters)
        {
            ArgumentNullException.ThrowIfNull(w);
            ArgumentNullException.ThrowIfNull(parameters);
            if (!_started)
            {
                // The chunk's first point names the parameters for the rest.
                _started = true;
                _names.AddRange(parameters.Keys);
                _columns = (parameters as Planning.PointParameters)?.Columns;
                w.WriteStartObject();
                w.WriteStartArray(NamesKey);
                foreach (var name in _names)
                {
                    w.WriteStringValue(name);
                }

                w.WriteEndArray();
                w.WriteEndObject();
            }

            w.WriteStartArray();
            w.WriteStringValue(pointId);
            w.WriteNumberValue(index);
            if (parameters is Planning.PointParameters planned && _columns is not null && ReferenceEquals(planned.Columns, _columns))
            {
                // A plan's point: its values by position, without an enumerator per point.
                w.WriteStartArray();
                for (var i = 0; i < _columns.Length; i++)
                {
                    CatalogJson.WriteValue(w, planned.ValueAt(i));
                }

                w.WriteEndArray();
            }
            else if (HasTheNames(parameters))
            {
                w.WriteStartArray();
                foreach (var (_, value) in parameters)
                {
                    CatalogJson.WriteValue(w, value);
                }

                w.WriteEndArray();
            }
            else
            {
                CatalogJson.WriteParameters(w, parameters);
            }

            w.WriteEndArray();
        }

        public static void End(Utf8JsonWriter w)
        {
            ArgumentNullException.ThrowIfNull(w);
            w.WriteEndArray();
        }

        /// <summary>Whether the parameters enumerate exactly the chunk's names in their order.</summary>
        private bool HasTheNames(IReadOnlyDictionary<string, object> parameters)
        {
            if (parameters.Count != _names.Count)
            {
                return false;
            }

            var i = 0;
            foreach (var (key, _) in parameters)
            {
                if (!string.Equals(key, _names[i++], StringComparison.Ordinal))
                {
                    return false;
                }
            }

            return true;
        }
    }

    /// <summary>
    /// The text in the layout of stores from before the names header, <c>[[point_id, point_index, {parameters}], ...]</c>
    /// (returned as it is when it has that layout already): the form SQLite's one-statement insert unpacks
    /// (pairing names and values inside SQL took ~1.7 times as long per chunk as this and that insert).
    /// </summary>
    public static string PerPointLayout(string text, string chunkId)
    {
        ArgumentNullException.ThrowIfNull(text);
        if (!text.StartsWith("[{", StringComparison.Ordinal))
        {
            return text;
        }

        var buffer = new ArrayBufferWriter<byte>(text.Length * 2);
        using (var w = new Utf8JsonWriter(buffer))
        {
            w.WriteStartArray();
            foreach (var row in Decode(text, chunkId))
            {
                w.WriteStartArray();
                w.WriteStringValue(row.PointId);
                w.WriteNumberValue(row.Index);
                w.WriteRawValue(row.ParametersJson, skipInputValidation: true);
                w.WriteEndArray();
            }

            w.WriteEndArray();
        }

        return System.Text.Encoding.UTF8.GetString(buffer.WrittenSpan);
    }

    /// <summary>The points of a chunk's text (either layout), in the order written (plan order), with each point's parameters as a JSON object's text.</summary>
    public static List<PointRow> Decode(string text, string chunkId)
    {
        using var doc = JsonDocument.Parse(text);
        var root = doc.RootElement;
        var rows = new List<PointRow>(root.GetArrayLength());
        string[] names = [];
        var buffer = new ArrayBufferWriter<byte>(256);
        using var w = new Utf8JsonWriter(buffer);
        foreach (var p in root.EnumerateArray())
        {
            if (p.ValueKind == JsonValueKind.Object)
            {
                names = [.. p.GetProperty(NamesKey).EnumerateArray().Select(n => n.GetString()!)];
                continue;
            }

            var parameters = p[2];
            string json;
            if (parameters.ValueKind == JsonValueKind.Array)
            {
                buffer.ResetWrittenCount();
                w.Reset(buffer);
                w.WriteStartObject();
                var i = 0;
                foreach (var value in parameters.EnumerateArray())
                {
                    w.WritePropertyName(names[i++]);
                    w.WriteRawValue(value.GetRawText(), skipInputValidation: true);
                }

                w.WriteEndObject();
                w.Flush();
                json = System.Text.Encoding.UTF8.GetString(buffer.WrittenSpan);
            }
            else
            {
                json = parameters.GetRawText();
            }

            rows.Add(new PointRow(p[0].GetString()!, p[1].GetInt64(), chunkId, json));
        }

        return rows;
    }
}
