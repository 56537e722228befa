namespace LatticeSweep.Worker.Output;

/// <summary>
/// Gives the repeated values of a text column one string each while the merge by columns gathers the column
/// (<see cref="StreamingMerge"/>). Parquet.Net decodes a new string for every cell, even of a column with one
/// value (`engine_version`, `sample_kind`, `state`): an output row group's 131,072 of them lived while ~100
/// inputs were read into it, outlived two collections and died in the oldest generation (~15 MB of dead
/// strings a pass at 10^6 points, bench/README.md round 19). With the cells pointing at one string per
/// value, the decoded ones die young. Values past <see cref="MaxValues"/> distinct ones in a column are kept
/// as they are (free text, such as a failure's message).
/// </summary>
internal sealed class SharedTexts
{
    /// <summary>Distinct values of one column given a shared string.</summary>
    public const int MaxValues = 256;

    private readonly Dictionary<string, string> _values = new(StringComparer.Ordinal);
    private string? _last;

    /// <summary>Forgets the values (a new column).</summary>
    public void Clear()
    {
        _values.Clear();
        _last = null;
    }

    /// <summary>Replaces each of the first <paramref name="count"/> cells by the shared string of its value.</summary>
    public void Share(string?[] cells, int count)
    {
        ArgumentNullException.ThrowIfNull(cells);
        for (var i = 0; i < count; i++)
        {
            if (cells[i] is not { } text)
            {
                continue;
            }

            // Runs of one value are the common case: the last shared string answers them without a look-up.
            if (_last is not null && string.Equals(text, _last, StringComparison.Ordinal))
            {
                cells[i] = _last;
                continue;
            }

            if (_values.TryGetValue(text, out var shared))
            {
                cells[i] = shared;
                _last = shared;
            }
            else if (_values.Count < MaxValues)
            {
                _values[text] = text;
                _last = text;
            }
        }
    }
}
