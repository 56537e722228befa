using Parquet;
using Parquet.Meta;
using Parquet.Schema;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// What the inputs of one merge pass have alike in their parsed footers, kept once for all of them: the columns
/// (<see cref="ColumnDef"/>s with their names and units) and each column chunk's path and list of encodings, which
/// Parquet.Net parses anew for every file and every chunk. A pass holds up to ~110 inputs open at once (a 10^6-point
/// run's final pass of points/, 166 columns each), and these copies were about a quarter of an open input's parsed
/// footer (~5 MiB of the pass's ~47 MiB at 110 inputs, by heap dumps: bench/README, round 21). The lists are only
/// read once a file is open, so inputs can share equal ones. Likewise the schema's data fields an input reads its columns
/// by (<see cref="Fields"/>): Parquet.Net builds a new schema each time it is asked, ~32 KiB for 166 columns, which an
/// input kept for the whole pass (bench/README, round 25).
/// </summary>
internal sealed class SharedFooterParts
{
    /// <summary>Distinct lists kept at most (a pass's inputs have one table's columns; more means something else is going on).</summary>
    private const int MostLists = 4096;

    private readonly Dictionary<string, List<string>> _paths = new(StringComparer.Ordinal);

    private readonly Dictionary<string, List<Encoding>> _encodings = new(StringComparer.Ordinal);

    private IReadOnlyList<ColumnDef>? _columns;

    private ParquetSchema? _schema;

    private DataField[]? _fields;

    /// <summary>The columns kept for the pass when <paramref name="columns"/> equal them, else <paramref name="columns"/> (kept when none are yet).</summary>
    public IReadOnlyList<ColumnDef> Columns(IReadOnlyList<ColumnDef> columns)
    {
        ArgumentNullException.ThrowIfNull(columns);
        if (_columns is null)
        {
            _columns = columns;
            return columns;
        }

        return _columns.SequenceEqual(columns) ? _columns : columns;
    }

    /// <summary>
    /// The data fields of the pass's first schema when <paramref name="schema"/> equals it (same fields, names, types,
    /// nullability, nesting, and for timestamps the same format and unit), else <paramref name="schema"/>'s own. A row group
    /// reader finds a column's chunk by the field's path and takes its levels from the field, so a field of an equal schema
    /// reads the same chunk.
    /// </summary>
    public DataField[] Fields(ParquetSchema schema)
    {
        ArgumentNullException.ThrowIfNull(schema);
        var fields = schema.GetDataFields();
        if (_schema is null)
        {
            _schema = schema;
            _fields = fields;
            return fields;
        }

        return _schema.Equals(schema) && _fields!.Length == fields.Length && _fields.Zip(fields).All(p => Alike(p.First, p.Second)) ? _fields : fields;
    }

    /// <summary>Parquet.Net's equality of fields leaves out a timestamp's format and unit (a date equals a timestamp): compared here.</summary>
    private static bool Alike(DataField a, DataField b) =>
        a.Equals(b) && a.GetType() == b.GetType()
        && (a is not DateTimeDataField at || b is DateTimeDataField bt && at.DateTimeFormat == bt.DateTimeFormat && at.IsAdjustedToUTC == bt.IsAdjustedToUTC && at.Unit == bt.Unit);

    /// <summary>Points every column chunk of <paramref name="reader"/>'s footer at the pass's copy of its path and encodings.</summary>
    public void ShareChunkLists(ParquetReader reader)
    {
        ArgumentNullException.ThrowIfNull(reader);
        foreach (var group in reader.Metadata?.RowGroups ?? [])
        {
            foreach (var chunk in group.Columns)
            {
                if (chunk.MetaData is not { } meta)
                {
                    continue;
                }

                meta.PathInSchema = Shared(_paths, meta.PathInSchema, p => string.Join('\u0001', p));
                meta.Encodings = Shared(_encodings, meta.Encodings, e => string.Join(',', e.Select(x => (int)x)));
            }
        }
    }

    private static List<T> Shared<T>(Dictionary<string, List<T>> kept, List<T> list, Func<List<T>, string> keyOf)
    {
        if (list is null)
        {
            return list!;
        }

        var key = keyOf(list);
        if (kept.TryGetValue(key, out var same))
        {
            return same;
        }

        if (kept.Count < MostLists)
        {
            kept[key] = list;
        }

        return list;
    }
}
