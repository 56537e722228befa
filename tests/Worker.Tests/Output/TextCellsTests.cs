using LatticeSweep.Worker.Output;
using LatticeSweep.Worker.Tests.Support;
using Parquet;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>
/// A text column read without a string per cell (<see cref="TextCells"/>), against Parquet.Net's own
/// string reading of the same file (invented demo cells): the same values and nulls in the same rows, equal
/// neighbours sharing one string, and the merge's point ids (<see cref="MergeIds"/>) the same as from the strings.
/// </summary>
public sealed class TextCellsTests : IDisposable
{
    private static readonly ColumnDef[] Columns =
    [
        new("point_id", ColumnType.Text, "", ""),
        new("curve", ColumnType.Text, "", ""),
    ];

    private static readonly string?[] Ids =
    [
        null, "00000000000000ff", "00000000000000ff", "00000000000000ff", "0f0f0f0f0f0f0f0f", null, null,
        "0F0F0F0F0F0F0F0F", "p01", "p01", "", "", "ffffffffffffffff", "ffffffffffffffff", "7fffffffffffffff", "é-point", null,
    ];

    private static readonly string?[] Curves =
    [
        "total", "total", "site", "site", null, "site", "total", "total", "", "", "total", null, null, "site", "sité", "sité", "total",
    ];

    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public async Task Cells_read_as_characters_give_the_strings_and_nulls_Parquet_Net_reads_and_runs_share_one_string()
    {
        var file = await WriteAsync();
        await using var stream = File.OpenRead(file);
        await using var reader = await ParquetReader.CreateAsync(stream);
        var fields = reader.Schema.GetDataFields();
        using var group = reader.OpenRowGroupReader(0);
        for (var c = 0; c < Columns.Length; c++)
        {
            var expected = new string?[Ids.Length];
            await group.ReadAsync(fields[c], expected.AsMemory());
            Assert.Equal(c == 0 ? Ids : Curves, expected);

            using var cells = await TextCells.ReadAsync(group, fields[c], CancellationToken.None);
            Assert.Equal(Ids.Length, cells.Rows);
            for (var i = 0; i < cells.Rows; i++)
            {
                Assert.Equal(expected[i] is null, cells.IsNull(i));
                Assert.Equal(expected[i] ?? "", cells.Chars(i).ToString());
            }

            var copied = new string?[Ids.Length + 3];
            Assert.Equal(Ids.Length, cells.CopyInto(copied));
            Assert.Equal(expected, copied.Take(Ids.Length));
            for (var i = 1; i < Ids.Length; i++)
            {
                if (copied[i] is not null && copied[i] == copied[i - 1])
                {
                    Assert.Same(copied[i - 1], copied[i]);
                }
            }
        }
    }

    [Fact]
    public async Task The_merge_keeps_the_same_ids_from_the_characters_as_from_the_strings()
    {
        var file = await WriteAsync();
        await using var stream = File.OpenRead(file);
        await using var reader = await ParquetReader.CreateAsync(stream);
        using var group = reader.OpenRowGroupReader(0);
        using var cells = await TextCells.ReadAsync(group, reader.Schema.GetDataFields()[0], CancellationToken.None);
        var fromChars = MergeIds.Of(cells);
        var fromStrings = MergeIds.Of(Ids);
        Assert.Equal(fromStrings.Length, fromChars.Length);
        for (var i = 0; i < Ids.Length; i++)
        {
            Assert.Equal(Ids[i], fromChars.TextAt(i));
            Assert.Equal(fromStrings[i].Keyed, fromChars[i].Keyed);
            Assert.Equal(0, MergeId.Compare(fromStrings[i], fromChars[i]));
        }

        // The id column as the merge writes it: every row's text, each run of one key as one string.
        var written = new string?[Ids.Length];
        var rows = Enumerable.Range(0, Ids.Length).ToArray();
        fromChars.ScatterTextInto(written, rows, rows, 0, Ids.Length);
        Assert.Equal(Ids, written);
        Assert.Same(written[1], written[3]);
        Assert.Same(written[12], written[13]);
    }

    private async Task<string> WriteAsync()
    {
        var file = _dir.Combine("cells.parquet");
        await using var stream = File.Create(file);
        await using var writer = await ParquetTableWriter.CreateAsync(stream, Columns, new Dictionary<string, string>(), CancellationToken.None);
        await writer.WriteRowGroupAsync(new TableRows("demo", Columns, Ids.Length, [Ids.ToArray(), Curves.ToArray()]), CancellationToken.None);
        return file;
    }
}
