using System.Buffers;
using System.Text.Encodings.Web;
using System.Text.Json;

namespace LatticeSweep.Worker.Catalog;

/// <summary>
/// Rows for one SQLite statement as a JSON array of arrays, which the statement unpacks with
/// <c>json_each</c> and <c>json_extract</c>: one bound parameter however many rows (SQLite looks a
/// bound parameter's name up among all the statement's names, so a statement of many rows of
/// parameters costs more per row the more rows it has).
/// </summary>
internal static class SqliteJsonRows
{
    // Non-ASCII goes as UTF-8 rather than \u escapes: json_extract gives back the same text either way.
    private static readonly JsonWriterOptions Options = new() { Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping };

    /// <summary>The JSON array that <paramref name="rows"/> writes into (each row an array).</summary>
    public static string Write(Action<Utf8JsonWriter> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        var buffer = new ArrayBufferWriter<byte>(4096);
        using (var w = new Utf8JsonWriter(buffer, Options))
        {
            w.WriteStartArray();
            rows(w);
            w.WriteEndArray();
        }

        return System.Text.Encoding.UTF8.GetString(buffer.WrittenSpan);
    }

    /// <summary>
    /// Whether <paramref name="text"/> comes back from <c>json_extract</c> exactly as bound as a
    /// parameter would store it: not with a NUL (SQLite's text functions stop there) or a lone surrogate
    /// (which the JSON writer refuses, and a bound string stores as U+FFFD).
    /// </summary>
    public static bool Carries(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        for (var i = 0; i < text.Length; i++)
        {
            var ch = text[i];
            if (ch == '\0')
            {
                return false;
            }

            if (char.IsHighSurrogate(ch) && i + 1 < text.Length && char.IsLowSurrogate(text[i + 1]))
            {
                i++;
                continue;
            }

            if (char.IsSurrogate(ch))
            {
                return false;
            }
        }

        return true;
    }
}
