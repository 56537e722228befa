using System.Collections.Immutable;
using System.Security.Cryptography;
using System.Text;
using Parquet.Serialization;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>Reads a candidates table from CSV (RFC 4180 quoting, header row) or Parquet (Parquet.Net).</summary>
internal static class CandidateTableReader
{
    public const int MaxRows = 1_000_000;

    /// <summary>Reads the table; every problem is added to <paramref name="problems"/> located at the file (row, column) or at the job-file key.</summary>
    public static CandidateTable? Read(CandidatesDeclaration declaration, ProblemCollector problems)
    {
        var path = declaration.FilePath;
        if (!File.Exists(path))
        {
            declaration.Table.Error("file", $"candidates file not found: {path}");
            return null;
        }

        byte[] bytes;
        try
        {
            bytes = File.ReadAllBytes(path);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            declaration.Table.Error("file", $"cannot read candidates file {path}: {e.Message}");
            return null;
        }

        var hash = Convert.ToHexStringLower(SHA256.HashData(bytes));
        var extension = Path.GetExtension(path).ToLowerInvariant();
        return extension switch
        {
            ".csv" => ReadCsv(path, bytes, hash, problems),
            ".parquet" => ReadParquet(path, bytes, hash, problems),
            _ => Unsupported(declaration, extension),
        };
    }

    private static CandidateTable? Unsupported(CandidatesDeclaration declaration, string extension)
    {
        declaration.Table.Error("file", $"a candidates file must end in .csv or .parquet, got '{EchoText.Of(extension)}'");
        return null;
    }

    private static CandidateTable? ReadCsv(string path, byte[] bytes, string hash, ProblemCollector problems)
    {
        var text = new UTF8Encoding(false, true).GetString(bytes).TrimStart('\uFEFF');
        var records = new List<(int Line, List<string> Cells)>();
        var before = problems.Count;
        ParseCsv(text, path, records, problems);
        if (problems.Count > before)
        {
            return null;
        }

        // Blank lines (a trailing newline, spacing) carry no candidate.
        records.RemoveAll(r => r.Cells.Count == 1 && r.Cells[0].Trim().Length == 0);
        if (records.Count == 0)
        {
            problems.Add(new JobFileProblem(path, 1, 1, "", "the candidates file is empty; it needs a header row and at least one row"));
            return null;
        }

        var header = records[0].Cells.Select(h => h.Trim()).ToImmutableArray();
        var duplicate = header.GroupBy(h => h, StringComparer.Ordinal).FirstOrDefault(g => g.Count() > 1);
        if (duplicate is not null)
        {
            problems.Add(new JobFileProblem(path, records[0].Line, header.IndexOf(duplicate.Key) + 1, duplicate.Key, "column name appears twice in the header"));
        }

        var rows = new List<ImmutableArray<object?>>();
        var lines = new List<int>();
        foreach (var (line, cells) in records.Skip(1))
        {
            if (cells.Count != header.Length)
            {
                problems.Add(new JobFileProblem(path, line, 1, "", $"row has {cells.Count} cell(s) but the header has {header.Length}"));
                continue;
            }

            rows.Add([.. cells.Select(c => (object?)c.Trim())]);
            lines.Add(line);
        }

        if (rows.Count == 0 && problems.Count == before)
        {
            problems.Add(new JobFileProblem(path, records[0].Line, 1, "", "the candidates file has a header but no rows"));
        }

        if (rows.Count > MaxRows)
        {
            problems.Add(new JobFileProblem(path, 0, 0, "", $"more than {MaxRows} candidates"));
        }

        return problems.Count > before ? null : new CandidateTable(path, header, [.. rows], [.. lines], hash);
    }

    /// <summary>RFC 4180: fields separated by commas, optionally quoted with "", quotes doubled inside quotes, newlines allowed inside quotes.</summary>
    private static void ParseCsv(string text, string path, List<(int Line, List<string> Cells)> records, ProblemCollector problems)
    {
        var line = 1;
        var recordLine = 1;
        var cells = new List<string>();
        var cell = new StringBuilder();
        var inQuotes = false;
        var quoteLine = 0;
        for (var i = 0; i < text.Length; i++)
        {
            var ch = text[i];
            if (inQuotes)
            {
                if (ch == '"')
                {
                    if (i + 1 < text.Length && text[i + 1] == '"')
                    {
                        cell.Append('"');
                        i++;
                    }
                    else
                    {
                        inQuotes = false;
                    }
                }
                else
                {
                    if (ch == '\n')
                    {
                        line++;
                    }

                    cell.Append(ch);
                }

                continue;
            }

            switch (ch)
            {
                case '"' when cell.ToString().Trim().Length == 0:
                    cell.Clear();
                    inQuotes = true;
                    quoteLine = line;
                    break;
                case ',':
                    cells.Add(cell.ToString());
                    cell.Clear();
                    break;
                case '\r':
                    break;
                case '\n':
                    cells.Add(cell.ToString());
                    cell.Clear();
                    records.Add((recordLine, cells));
                    cells = [];
                    line++;
                    recordLine = line;
                    break;
                default:
                    cell.Append(ch);
                    break;
            }
        }

        if (inQuotes)
        {
            problems.Add(new JobFileProblem(path, quoteLine, 0, "", "a quoted cell is never closed (missing '\"')"));
            return;
        }

        if (cell.Length > 0 || cells.Count > 0)
        {
            cells.Add(cell.ToString());
            records.Add((recordLine, cells));
        }
    }

    private static CandidateTable? ReadParquet(string path, byte[] bytes, string hash, ProblemCollector problems)
    {
        try
        {
            using var stream = new MemoryStream(bytes, writable: false);
            var result = ParquetSerializer.DeserializeUntypedAsync(stream).GetAwaiter().GetResult();
            var columns = result.Schema.Fields.Select(f => f.Name).ToImmutableArray();
            var rows = new List<ImmutableArray<object?>>();
            foreach (var row in result.Data)
            {
                rows.Add([.. columns.Select(c => row.TryGetValue(c, out var v) ? Normalise(v) : null)]);
            }

            if (rows.Count == 0)
            {
                problems.Add(new JobFileProblem(path, 0, 0, "", "the candidates file has no rows"));
                return null;
            }

            return new CandidateTable(path, columns, [.. rows], [.. Enumerable.Range(1, rows.Count)], hash);
        }
        catch (Exception e) when (e is IOException or InvalidDataException or NotSupportedException or InvalidOperationException or ArgumentException or FormatException || e.GetType().Namespace?.StartsWith("Parquet", StringComparison.Ordinal) == true)
        {
            problems.Add(new JobFileProblem(path, 0, 0, "", $"not a readable Parquet file: {e.Message}"));
            return null;
        }
    }

    private static object? Normalise(object? v) => v switch
    {
        int i => (long)i,
        short s => (long)s,
        byte b => (long)b,
        float f => (double)f,
        decimal m => (double)m,
        _ => v,
    };
}
