using LatticeSweep.Worker.Output;

namespace LatticeSweep.Worker.Tests.Output;

/// <summary>The merge's point ids as keys or text (invented ids): the order and the texts are those of the strings.</summary>
public sealed class MergeIdsTests
{
    private static readonly string?[] Mixed =
    [
        "00000000000000ff", "ffffffffffffffff", "0000000000000000", "8000000000000000", "7fffffffffffffff",
        "00000000000000FF", "0000000000000", "00000000000000000", "p01", "", null, "a", "zzzzzzzzzzzzzzzz", "0f0f0f0f0f0f0f0f",
    ];

    [Fact]
    public void Ids_of_a_slice_whose_runs_share_one_string_are_the_ids_of_each_cell_held_on_its_own()
    {
        // A kept part's column: each point's rows share one string (as rows are built), keys and texts mixed, read a row group at a time.
        var random = new Random(5);
        var column = Mixed.Concat(Enumerable.Range(0, 40).Select(_ => (string?)$"{random.NextInt64():x16}"))
            .SelectMany(id => Enumerable.Repeat(id, 1 + random.Next(4))).ToArray();
        foreach (var (start, count) in new[] { (0, column.Length), (3, 17), (column.Length - 9, 9), (5, 0) })
        {
            var slice = MergeIds.Of(column, start, count);
            var alone = MergeIds.Of(column.Skip(start).Take(count).Select(id => id is null ? null : new string(id.AsSpan())).ToArray());
            Assert.Equal(count, slice.Length);
            for (var i = 0; i < count; i++)
            {
                Assert.Equal(0, MergeId.Compare(alone[i], slice[i]));
                Assert.Equal(alone.TextAt(i), slice.TextAt(i));
                Assert.Equal(column[start + i], slice.TextAt(i));
            }
        }
    }

    [Fact]
    public void Keys_and_texts_compare_as_the_ordinal_order_of_the_texts()
    {
        var random = new Random(3);
        var ids = Mixed.Concat(Enumerable.Range(0, 200).Select(_ => (string?)$"{random.NextInt64():x16}")).ToArray();
        var held = MergeIds.Of(ids);
        for (var a = 0; a < ids.Length; a++)
        {
            for (var b = 0; b < ids.Length; b++)
            {
                Assert.Equal(Math.Sign(string.CompareOrdinal(ids[a], ids[b])), Math.Sign(MergeId.Compare(held[a], held[b])));
            }
        }
    }

    [Fact]
    public void Each_id_comes_back_as_the_same_text_and_only_lower_case_hex_of_sixteen_digits_is_held_as_a_key()
    {
        var held = MergeIds.Of(Mixed);
        Assert.Equal(Mixed.Length, held.Length);
        for (var i = 0; i < Mixed.Length; i++)
        {
            Assert.Equal(Mixed[i], held.TextAt(i));
            var keyed = Mixed[i] is { Length: 16 } t && t.All(c => c is >= '0' and <= '9' or >= 'a' and <= 'f');
            Assert.Equal(keyed, held[i].Keyed);
        }

        var destination = new string?[4];
        held.ScatterTextInto(destination, to: [3, 0], from: [1, 8], start: 0, end: 2);
        Assert.Equal(new string?[] { "p01", null, null, "ffffffffffffffff" }, destination);
    }
}
