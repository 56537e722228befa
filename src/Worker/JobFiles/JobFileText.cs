using System.Globalization;
using System.Text;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// Reads a job file as text, or says in one line why it is not one: missing, a folder, too
/// large, binary (with the format when it is a well-known one), UTF-16, or not UTF-8. A TOML
/// file is UTF-8 text; without this check random bytes or a Parquet file give thousands of
/// syntax errors.
/// </summary>
internal static class JobFileText
{
    /// <summary>Largest job file read (a job file is a few kilobytes; large tables belong in a candidates file).</summary>
    public const long MaxBytes = 64L * 1024 * 1024;

    private static readonly (byte[] Magic, string Format)[] KnownFormats =
    [
        ("PAR1"u8.ToArray(), "a Parquet file"),
        ("SQLite format 3\0"u8.ToArray(), "an SQLite database (a store?)"),
        ([0x50, 0x4B, 0x03, 0x04], "a ZIP archive (a spreadsheet or document?)"),
        ([0x1F, 0x8B], "a gzip archive"),
        ("%PDF"u8.ToArray(), "a PDF document"),
        ([0x7F, 0x45, 0x4C, 0x46], "an executable"),
    ];

    /// <summary>The file's text; throws <see cref="JobFileException"/> with one located problem when it is not a readable text file.</summary>
    public static string Read(string path)
    {
        ArgumentNullException.ThrowIfNull(path);
        if (Directory.Exists(path))
        {
            throw Problem(path, "this is a folder, not a job file; give the path of a .toml job file" + TomlFilesIn(path));
        }

        byte[] bytes;
        try
        {
            var info = new FileInfo(path);
            if (info.Exists && info.Length > MaxBytes)
            {
                throw Problem(path, $"{Size(info.Length)} is too large for a job file (at most {Size(MaxBytes)}); put large tables of parameters in a candidates file ([sweep.candidates])");
            }

            bytes = File.ReadAllBytes(path);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or ArgumentException or NotSupportedException)
        {
            var reason = e is FileNotFoundException or DirectoryNotFoundException ? "job file not found" : "cannot read the job file: " + e.Message;
            throw Problem(path, reason);
        }

        return Decode(path, bytes);
    }

    /// <summary>The UTF-8 text of <paramref name="bytes"/> (a leading byte-order mark dropped), or a one-line problem.</summary>
    internal static string Decode(string path, byte[] bytes)
    {
        foreach (var (magic, format) in KnownFormats)
        {
            if (bytes.AsSpan().StartsWith(magic))
            {
                throw Problem(path, $"not a text file: it looks like {format}; a job file is TOML text (latsweep init FILE writes a starter one)");
            }
        }

        if (bytes.AsSpan().StartsWith(new byte[] { 0xFF, 0xFE }) || bytes.AsSpan().StartsWith(new byte[] { 0xFE, 0xFF }))
        {
            throw Problem(path, "the file is UTF-16 text; save it as UTF-8 (TOML files are UTF-8)");
        }

        var start = bytes.AsSpan().StartsWith(Encoding.UTF8.Preamble) ? Encoding.UTF8.Preamble.Length : 0;
        var body = bytes.AsSpan(start);
        var (odd, firstInvalid) = Survey(body);

        // Random bytes, or a format we do not know: say so once rather than list a syntax error per line.
        if (odd > Math.Max(8, body.Length / 100))
        {
            throw Problem(path, "not a text file: it holds many bytes that text does not (control bytes or bytes that are not UTF-8); a job file is TOML text (latsweep init FILE writes a starter one)");
        }

        if (firstInvalid >= 0)
        {
            var (line, column) = Position(body, firstInvalid);
            throw new JobFileException(new JobFileProblem(path, line, column, "",
                $"bytes that are not UTF-8 (byte {(start + firstInvalid).ToString(CultureInfo.InvariantCulture)}); TOML files are UTF-8: re-save the file as UTF-8 (it may have been saved as Latin-1 or another code page)"));
        }

        // A stray control character in otherwise good text is left to the TOML syntax check, which locates it.
        return Encoding.UTF8.GetString(body);
    }

    /// <summary>How many bytes text would not hold (control bytes other than tab, CR, LF, FF, and bytes of invalid UTF-8), and where the first invalid UTF-8 is (-1: none).</summary>
    private static (int Odd, int FirstInvalid) Survey(ReadOnlySpan<byte> bytes)
    {
        var odd = 0;
        var firstInvalid = -1;
        var i = 0;
        while (i < bytes.Length)
        {
            var b = bytes[i];
            if (b < 0x80)
            {
                if ((b < 0x20 && b is not (byte)'\t' and not (byte)'\n' and not (byte)'\r' and not 0x0C) || b == 0x7F)
                {
                    odd++;
                }

                i++;
                continue;
            }

            if (System.Text.Rune.DecodeFromUtf8(bytes[i..], out _, out var used) != System.Buffers.OperationStatus.Done)
            {
                odd++;
                if (firstInvalid < 0)
                {
                    firstInvalid = i;
                }

                i += Math.Max(1, used);
                continue;
            }

            i += used;
        }

        return (odd, firstInvalid);
    }

    /// <summary>1-based line and column (in characters, counting an undecodable byte as one) of a byte offset.</summary>
    private static (int Line, int Column) Position(ReadOnlySpan<byte> bytes, int offset)
    {
        var line = 1;
        var lineStart = 0;
        for (var i = 0; i < offset; i++)
        {
            if (bytes[i] == (byte)'\n')
            {
                line++;
                lineStart = i + 1;
            }
        }

        var column = 1;
        for (var i = lineStart; i < offset; i++)
        {
            // Count lead bytes only, so a multi-byte character is one column.
            if ((bytes[i] & 0xC0) != 0x80)
            {
                column++;
            }
        }

        return (line, column);
    }

    private static JobFileException Problem(string path, string message) => new(new JobFileProblem(path, 0, 0, "", message));

    private static string TomlFilesIn(string folder)
    {
        try
        {
            var files = Directory.EnumerateFiles(folder, "*.toml").Select(Path.GetFileName).Order(StringComparer.Ordinal).Take(4).ToList();
            return files.Count == 0 ? "" : $" (this folder holds {string.Join(", ", files.Select(f => EchoText.Of(f)))}{(files.Count == 4 ? ", ..." : "")})";
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return "";
        }
    }

    private static string Size(long bytes) => bytes >= 1024 * 1024
        ? (bytes / (1024.0 * 1024)).ToString("0.#", CultureInfo.InvariantCulture) + " MiB"
        : bytes.ToString("N0", CultureInfo.InvariantCulture) + " bytes";
}
