namespace LatticeSweep.Worker.Commands;

/// <summary>Aligned plain-text columns for the terminal: text left-aligned, numbers right-aligned.</summary>
internal sealed class TextTable
{
    private readonly string[] _headers;
    private readonly bool[] _rightAligned;
    private readonly List<string[]> _rows = [];

    public TextTable(string[] headers, bool[] rightAligned)
    {
        _headers = headers;
        _rightAligned = rightAligned;
    }

    public void Add(params string[] cells) => _rows.Add(cells);

    public void WriteTo(TextWriter writer, string indent = "")
    {
        var widths = _headers.Select((h, i) => Math.Max(h.Length, _rows.Count == 0 ? 0 : _rows.Max(r => r[i].Length))).ToArray();
        Write(writer, indent, _headers, widths);
        writer.WriteLine(indent + string.Join("  ", widths.Select(w => new string('-', w))));
        foreach (var row in _rows)
        {
            Write(writer, indent, row, widths);
        }
    }

    private void Write(TextWriter writer, string indent, string[] cells, int[] widths)
    {
        var parts = cells.Select((c, i) => _rightAligned[i] ? c.PadLeft(widths[i]) : c.PadRight(widths[i]));
        writer.WriteLine((indent + string.Join("  ", parts)).TrimEnd());
    }
}
