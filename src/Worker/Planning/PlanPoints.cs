using System.Collections;
using System.Runtime.CompilerServices;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// A plan's points in plan order, made on demand from their position: the parameters from the
/// axes (<see cref="Expansion.IndexedExpansion"/>), the id from the 8-byte key the planner computed
/// (the id must be known for the spec hash anyway). A plan of a million points so keeps 8 bytes per
/// point (4 more where duplicates were collapsed) instead of an object per point. Small lists built
/// by hand (tests) are kept as they are.
/// </summary>
[CollectionBuilder(typeof(PlanPoints), nameof(Create))]
public sealed class PlanPoints : IReadOnlyList<PlannedPoint>
{
    private readonly PlannedPoint[]? _given;
    private readonly ulong[] _keys;
    private readonly int[]? _expansionIndex;
    private readonly Func<long, PointParameters>? _parameters;
    private readonly Func<long, ulong>? _keyAt;
    private readonly int _lazyCount;
    private readonly bool _idsAsRegistered;

    private PlanPoints(PlannedPoint[] given)
    {
        _given = given;
        _keys = [];
    }

    internal PlanPoints(ulong[] keys, int[]? expansionIndex, Func<long, PointParameters> parameters)
    {
        _keys = keys;
        _expansionIndex = expansionIndex;
        _parameters = parameters;
    }

    /// <summary>
    /// A plan whose ids are computed when asked for (<paramref name="keyAt"/> of the expansion
    /// position, which is the point's index): a worker's plan of a sweep whose submit kept every point.
    /// </summary>
    internal PlanPoints(int count, Func<long, ulong> keyAt, Func<long, PointParameters> parameters)
    {
        _keys = [];
        _lazyCount = count;
        _keyAt = keyAt;
        _parameters = parameters;
    }

    private PlanPoints(PlanPoints lazy, bool idsAsRegistered)
    {
        _keys = [];
        _lazyCount = lazy._lazyCount;
        _keyAt = lazy._keyAt;
        _parameters = lazy._parameters;
        _idsAsRegistered = idsAsRegistered;
    }

    /// <summary>
    /// This lazy plan, finding a point by its index alone (<see cref="TryFind"/> takes the id as the catalog
    /// registered it instead of computing it again): for the process that submitted the sweep from this very
    /// definition, whose sweep id was derived from every point's id in plan order, so the id registered at an
    /// index is the plan's. Computing it again costs ~6 us a point (bench/README round 23).
    /// </summary>
    internal PlanPoints WithIdsAsRegistered() => _keyAt is not null
        ? new PlanPoints(this, idsAsRegistered: true)
        : throw new InvalidOperationException("only a lazy plan takes its ids as registered");

    public static PlanPoints Empty { get; } = new([]);

    public static PlanPoints Create(ReadOnlySpan<PlannedPoint> points) => new(points.ToArray());

    public int Count => _given?.Length ?? (_keyAt is null ? _keys.Length : _lazyCount);

    /// <summary>The same as <see cref="Count"/> (plans used to hold an array).</summary>
    public int Length => Count;

    public bool IsEmpty => Count == 0;

    public PlannedPoint this[int index] => _given is { } g
        ? g[index]
        : new PlannedPoint(IdAt(index), index, ParametersAt(index));

    /// <summary>The id of the point at <paramref name="index"/>, without making its parameters.</summary>
    public string IdAt(int index) => _given is { } g ? g[index].PointId : PointIdentity.IdText(KeyAt(index));

    private ulong KeyAt(int index) => _keyAt is { } keyAt
        ? (uint)index < (uint)_lazyCount ? keyAt(index) : throw new ArgumentOutOfRangeException(nameof(index))
        : _keys[index];

    /// <summary>Every point's key by index (the id is its text, <see cref="PointIdentity.IdText"/>); null for a lazy plan or one built by hand.</summary>
    internal ReadOnlyMemory<ulong>? Keys => _given is null && _keyAt is null ? _keys : null;

    /// <summary>The parameters of the point at <paramref name="index"/>.</summary>
    public PointParameters ParametersAt(int index) => _given is { } g
        ? g[index].Parameters
        : _parameters!(_expansionIndex is { } e ? e[index] : index);

    /// <summary>The position in the expansion of the point at <paramref name="index"/> (the index itself unless duplicates were collapsed).</summary>
    internal long ExpansionPositionOf(int index) => _expansionIndex is { } e ? e[index] : index;

    /// <summary>Every position, ordered by the point's id (ordinal: the same as by key, the ids being fixed-width hex).</summary>
    public int[] PositionsById()
    {
        var positions = new int[Count];
        for (var i = 0; i < positions.Length; i++)
        {
            positions[i] = i;
        }

        if (_given is { } g)
        {
            Array.Sort(positions, (a, b) => string.CompareOrdinal(g[a].PointId, g[b].PointId));
        }
        else
        {
            var keys = _keyAt is null ? (ulong[])_keys.Clone() : [.. Enumerable.Range(0, Count).Select(KeyAt)];
            Array.Sort(keys, positions);
        }

        return positions;
    }

    /// <summary>
    /// The point with id <paramref name="pointId"/>: first looked for at <paramref name="indexHint"/>
    /// (its index in the catalog), else searched for.
    /// </summary>
    public bool TryFind(string pointId, int indexHint, out PlannedPoint point)
    {
        ArgumentNullException.ThrowIfNull(pointId);
        if (_idsAsRegistered && indexHint >= 0 && indexHint < Count)
        {
            point = new PlannedPoint(pointId, indexHint, ParametersAt(indexHint));
            return true;
        }

        if (indexHint >= 0 && indexHint < Count && string.Equals(IdAt(indexHint), pointId, StringComparison.Ordinal))
        {
            // The id just compared is the point's: a lazy plan does not compute it a second time.
            point = _given is { } given ? given[indexHint] : new PlannedPoint(pointId, indexHint, ParametersAt(indexHint));
            return true;
        }

        if (_given is { } g)
        {
            var i = Array.FindIndex(g, p => string.Equals(p.PointId, pointId, StringComparison.Ordinal));
            point = i >= 0 ? g[i] : null!;
            return i >= 0;
        }

        // A lazy plan is not searched (that would hash every point): the index names the point.
        if (_keyAt is null && PointIdentity.TryKey(pointId, out var key))
        {
            var i = Array.IndexOf(_keys, key);
            if (i >= 0)
            {
                point = this[i];
                return true;
            }
        }

        point = null!;
        return false;
    }

    public IEnumerator<PlannedPoint> GetEnumerator()
    {
        for (var i = 0; i < Count; i++)
        {
            yield return this[i];
        }
    }

    IEnumerator IEnumerable.GetEnumerator() => GetEnumerator();
}
