using System.Buffers;
using Parquet;
using Parquet.Schema;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// One text column of an open row group as Parquet.Net decodes it (a character buffer per cell), before it
/// is made into strings: <c>ReadAsync(field, Memory&lt;string?&gt;)</c> copies every cell into a new string
/// on top of that, so a merge of a long table made two objects per cell of each text column (a 300-point
/// `dos/` of 180,000 rows: ~20 MB per text column, bench/README, round 21). The merge makes keys of the point
/// ids straight from the characters (<see cref="MergeIds.Of(TextCells)"/>) and one string per run of equal
/// cells of the other text columns (<see cref="CopyInto"/>). The arrays are rented and given back on dispose.
/// </summary>
internal sealed class TextCells : IDisposable
{
    private ReadOnlyMemory<char>[]? _cells;
    private int[]? _levels;

    private TextCells(ReadOnlyMemory<char>[] cells, int[]? levels, int rows, int maxLevel)
    {
        _cells = cells;
        _levels = levels;
        Rows = rows;
        MaxLevel = maxLevel;
    }

    public int Rows { get; }

    private int MaxLevel { get; }

    /// <summary>Reads column <paramref name="field"/> of <paramref name="group"/> (a text column, optional or required, not repeated).</summary>
    public static async Task<TextCells> ReadAsync(ParquetRowGroupReader group, DataField field, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(group);
        ArgumentNullException.ThrowIfNull(field);
        var rows = checked((int)group.RowCount);
        var cells = ArrayPool<ReadOnlyMemory<char>>.Shared.Rent(Math.Max(rows, 1));
        var levels = field.MaxDefinitionLevel > 0 ? ArrayPool<int>.Shared.Rent(Math.Max(rows, 1)) : null;
        var read = new TextCells(cells, levels, rows, field.MaxDefinitionLevel);
        try
        {
            await group.ReadRawAsync(field, cells.AsMemory(0, rows), levels?.AsMemory(0, rows), null, ct).ConfigureAwait(false);
            read.Spread();
            return read;
        }
        catch
        {
            read.Dispose();
            throw;
        }
    }

    /// <summary>Whether row <paramref name="row"/> has no value.</summary>
    public bool IsNull(int row) => _levels is { } l && l[row] < MaxLevel;

    /// <summary>Row <paramref name="row"/>'s characters (empty for a null cell: ask <see cref="IsNull"/>).</summary>
    public ReadOnlySpan<char> Chars(int row) => _cells![row].Span;

    /// <summary>
    /// Row <paramref name="row"/> as a string: <paramref name="last"/> when it holds the same characters (a run
    /// of one value, the common case), else a new one, which becomes <paramref name="last"/>.
    /// </summary>
    public string? Text(int row, ref string? last)
    {
        if (IsNull(row))
        {
            return null;
        }

        var chars = Chars(row);
        if (last is null || !chars.SequenceEqual(last))
        {
            last = new string(chars);
        }

        return last;
    }

    /// <summary>The cells as strings into the first <see cref="Rows"/> of <paramref name="destination"/> (equal neighbours share one string); returns the rows.</summary>
    public int CopyInto(string?[] destination)
    {
        ArgumentNullException.ThrowIfNull(destination);
        string? last = null;
        for (var i = 0; i < Rows; i++)
        {
            destination[i] = Text(i, ref last);
        }

        return Rows;
    }

    /// <summary>Parquet.Net packs the values of the rows that have one at the front: put each at its row.</summary>
    private void Spread()
    {
        if (_levels is not { } levels)
        {
            return;
        }

        var cells = _cells!;
        var next = 0;
        for (var i = 0; i < Rows; i++)
        {
            next += levels[i] < MaxLevel ? 0 : 1;
        }

        for (var i = Rows - 1; i >= 0; i--)
        {
            cells[i] = levels[i] < MaxLevel ? default : cells[--next];
        }
    }

    public void Dispose()
    {
        if (_cells is { } cells)
        {
            // Cleared: a pooled array must not keep the decoded characters alive.
            ArrayPool<ReadOnlyMemory<char>>.Shared.Return(cells, clearArray: true);
            _cells = null;
        }

        if (_levels is { } levels)
        {
            ArrayPool<int>.Shared.Return(levels);
            _levels = null;
        }
    }
}
