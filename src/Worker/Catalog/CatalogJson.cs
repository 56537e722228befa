using System.Collections.Immutable;
using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Catalog;

/// <summary>JSON forms of axes and point parameters as the catalog stores them, typed by the axes on the way back.</summary>
internal static class CatalogJson
{
    public static string WriteAxes(IEnumerable<AxisInfo> axes)
    {
        var array = new JsonArray();
        foreach (var axis in axes)
        {
            var values = new JsonArray();
            foreach (var v in axis.Values)
            {
                values.Add(ToNode(v));
            }

            var node = new JsonObject
            {
                ["path"] = axis.Path,
                ["column"] = axis.ColumnName,
                ["unit"] = axis.Unit,
                ["type"] = axis.ValueType.ToString().ToLowerInvariant(),
                ["values"] = values,
            };
            if (axis.Drawn is { } d)
            {
                // A drawn axis: its interval instead of its values ("values" stays, empty, for readers that expect it).
                node["drawn"] = new JsonObject
                {
                    ["from"] = d.From,
                    ["to"] = d.To,
                    ["scale"] = d.Log ? "log" : "linear",
                    ["draws"] = d.Draws,
                    ["bins"] = d.Bins,
                };
            }

            array.Add(node);
        }

        return array.ToJsonString();
    }

    public static ImmutableArray<AxisInfo> ReadAxes(string json)
    {
        var result = ImmutableArray.CreateBuilder<AxisInfo>();
        foreach (var node in JsonNode.Parse(json)!.AsArray())
        {
            var type = Enum.Parse<AxisValueType>((string)node!["type"]!, ignoreCase: true);
            var values = node["values"]!.AsArray().Select(v => FromElement(v!, type)).ToImmutableArray();
            var drawn = node["drawn"] is JsonObject d
                ? new DrawnRange((double)d["from"]!, (double)d["to"]!, (string?)d["scale"] == "log", (long)d["draws"]!, (int)d["bins"]!)
                : null;
            result.Add(new AxisInfo((string)node["path"]!, (string)node["column"]!, (string)node["unit"]!, type, values) { Drawn = drawn });
        }

        return result.ToImmutable();
    }

    [ThreadStatic]
    private static System.Buffers.ArrayBufferWriter<byte>? _buffer;

    /// <summary>
    /// The same text as a <see cref="JsonObject"/> of <see cref="ToNode"/> values would write, written
    /// straight to UTF-8 (registering a million points makes a million of these).
    /// </summary>
    public static string WriteParameters(IReadOnlyDictionary<string, object> parameters)
    {
        ArgumentNullException.ThrowIfNull(parameters);
        var buffer = _buffer ??= new System.Buffers.ArrayBufferWriter<byte>(256);
        buffer.ResetWrittenCount();
        using (var w = new Utf8JsonWriter(buffer))
        {
            WriteParameters(w, parameters);
        }

        return System.Text.Encoding.UTF8.GetString(buffer.WrittenSpan);
    }

    /// <summary>The parameters as a JSON object written to <paramref name="w"/> (the text <see cref="WriteParameters(IReadOnlyDictionary{string, object})"/> returns).</summary>
    public static void WriteParameters(Utf8JsonWriter w, IReadOnlyDictionary<string, object> parameters)
    {
        ArgumentNullException.ThrowIfNull(w);
        ArgumentNullException.ThrowIfNull(parameters);
        w.WriteStartObject();
        foreach (var (key, value) in parameters)
        {
            w.WritePropertyName(key);
            WriteValue(w, value);
        }

        w.WriteEndObject();
    }

    /// <summary>One parameter's value as <see cref="WriteParameters(Utf8JsonWriter, IReadOnlyDictionary{string, object})"/> writes it after its name.</summary>
    public static void WriteValue(Utf8JsonWriter w, object? value)
    {
        ArgumentNullException.ThrowIfNull(w);
        switch (value)
        {
            case null:
                w.WriteNullValue();
                break;
            case double d when double.IsFinite(d):
                w.WriteNumberValue(d);
                break;
            case double d:
                w.WriteStringValue(d.ToString("R", CultureInfo.InvariantCulture));
                break;
            case float f:
                w.WriteNumberValue((double)f);
                break;
            case int i:
                w.WriteNumberValue((long)i);
                break;
            case long l:
                w.WriteNumberValue(l);
                break;
            case bool b:
                w.WriteBooleanValue(b);
                break;
            case string text:
                w.WriteStringValue(text);
                break;
            case IFormattable x:
                w.WriteStringValue(x.ToString(null, CultureInfo.InvariantCulture));
                break;
            default:
                if (value.ToString() is { } other)
                {
                    w.WriteStringValue(other);
                }
                else
                {
                    w.WriteNullValue();
                }

                break;
        }
    }

    public static ImmutableSortedDictionary<string, object> ReadParameters(string json, IReadOnlyDictionary<string, AxisValueType> types)
    {
        var builder = ImmutableSortedDictionary.CreateBuilder<string, object>(StringComparer.Ordinal);
        foreach (var (key, node) in JsonNode.Parse(json)!.AsObject())
        {
            if (node is null)
            {
                continue;
            }

            var type = types.TryGetValue(key, out var t) ? t : Infer(node);
            builder[key] = FromElement(node, type);
        }

        return builder.ToImmutable();
    }

    /// <summary>One parameter's value from its JSON text, typed as its axis; null for JSON null.</summary>
    public static object? ReadValue(string json, AxisValueType type) =>
        JsonNode.Parse(json) is { } node ? FromElement(node, type) : null;

    /// <summary>Text of a parameter value as shown to people and used to group coverage.</summary>
    public static string Show(object value) => value switch
    {
        double d => d.ToString("R", CultureInfo.InvariantCulture),
        float f => f.ToString("R", CultureInfo.InvariantCulture),
        IFormattable x => x.ToString(null, CultureInfo.InvariantCulture),
        _ => value.ToString() ?? "",
    };

    private static AxisValueType Infer(JsonNode node) =>
        node.GetValueKind() switch
        {
            JsonValueKind.Number => node.ToJsonString().Contains('.', StringComparison.Ordinal) || node.ToJsonString().Contains('e', StringComparison.OrdinalIgnoreCase)
                ? AxisValueType.Double
                : AxisValueType.Integer,
            _ => AxisValueType.Text,
        };

    private static JsonNode? ToNode(object? value) => value switch
    {
        null => null,
        double d when double.IsFinite(d) => JsonValue.Create(d),
        double d => JsonValue.Create(d.ToString("R", CultureInfo.InvariantCulture)),
        float f => JsonValue.Create((double)f),
        int i => JsonValue.Create((long)i),
        long l => JsonValue.Create(l),
        bool b => JsonValue.Create(b),
        string s => JsonValue.Create(s),
        IFormattable x => JsonValue.Create(x.ToString(null, CultureInfo.InvariantCulture)),
        _ => JsonValue.Create(value.ToString()),
    };

    private static object FromElement(JsonNode node, AxisValueType type)
    {
        var kind = node.GetValueKind();
        return type switch
        {
            AxisValueType.Double when kind == JsonValueKind.Number => node.GetValue<double>(),
            AxisValueType.Double => double.Parse(node.ToString(), CultureInfo.InvariantCulture),
            AxisValueType.Integer when kind == JsonValueKind.Number => node.GetValue<long>(),
            AxisValueType.Integer => long.Parse(node.ToString(), CultureInfo.InvariantCulture),
            _ when kind is JsonValueKind.True or JsonValueKind.False => node.GetValue<bool>() ? "true" : "false",
            _ => node.GetValueKind() == JsonValueKind.String ? node.GetValue<string>() : node.ToJsonString(),
        };
    }
}
