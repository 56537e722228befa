using System.Globalization;
using System.Text;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// Text from a job file (or the command line) shown back in a message: control and invisible
/// formatting characters written as escapes, so a NUL or a terminal escape sequence is never
/// printed raw, and long text cut, so a million-character value does not fill the screen.
/// </summary>
public static class EchoText
{
    /// <summary>Characters of a value kept when it is cut.</summary>
    public const int MaxValueChars = 60;

    /// <summary>Characters of a whole message line kept when it is cut (a last guard; values are cut first).</summary>
    public const int MaxLineChars = 2000;

    /// <summary>A value to quote in a message: escaped, and cut after <see cref="MaxValueChars"/> characters.</summary>
    public static string Of(string? text) => Cut(text ?? "", MaxValueChars);

    /// <summary>Escaped, and cut after <paramref name="maxChars"/> characters with a note of the full length.</summary>
    public static string Cut(string text, int maxChars)
    {
        ArgumentNullException.ThrowIfNull(text);
        if (text.Length <= maxChars)
        {
            return Escape(text);
        }

        var keep = maxChars;
        if (keep > 0 && char.IsHighSurrogate(text[keep - 1]))
        {
            keep--; // never split a surrogate pair
        }

        return Escape(text[..keep]) + $"... ({text.Length.ToString("N0", CultureInfo.InvariantCulture)} characters in all)";
    }

    /// <summary>
    /// Control characters (C0, DEL, C1) and invisible format characters (bidirectional overrides,
    /// zero-width characters) as <c>\n</c>, <c>\t</c>, <c>\r</c> or <c>\uXXXX</c>; everything else as given.
    /// </summary>
    public static string Escape(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        if (!text.Any(NeedsEscape))
        {
            return text;
        }

        var sb = new StringBuilder(text.Length + 16);
        foreach (var c in text)
        {
            if (!NeedsEscape(c))
            {
                sb.Append(c);
                continue;
            }

            sb.Append(c switch
            {
                '\n' => "\\n",
                '\r' => "\\r",
                '\t' => "\\t",
                _ => "\\u" + ((int)c).ToString("X4", CultureInfo.InvariantCulture),
            });
        }

        return sb.ToString();
    }

    private static bool NeedsEscape(char c) =>
        char.IsControl(c) || CharUnicodeInfo.GetUnicodeCategory(c) == UnicodeCategory.Format;
}
