using System.Collections.Immutable;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Catalog;

/// <summary>A planned sweep to register: the sweep's fields and every point with its chunk.</summary>
public sealed record NewSweep
{
    public required string SweepId { get; init; }
    public required string Name { get; init; }
    public required string Description { get; init; }
    public required string SpecHash { get; init; }
    public required string SourcePath { get; init; }
    public required string SpecText { get; init; }
    public required string OutputFolder { get; init; }
    public required ImmutableArray<AxisInfo> Axes { get; init; }
    public required ImmutableArray<string> Tables { get; init; }
    public required string EngineVersion { get; init; }
    /// <summary>
    /// Every point in plan order; may be computed as it is read (<see cref="ComputedList{T}"/>), so a
    /// million points need not be held at once. The points of a chunk must be consecutive in this list
    /// (the catalog stores each chunk as it passes); point ids are unique (the planner collapses duplicates).
    /// </summary>
    public required IReadOnlyList<NewPoint> Points { get; init; }

    /// <summary>
    /// Every point's id as the planner's 8-byte key (the id is its 16 lower-case hex digits), the point at
    /// position i of <see cref="Points"/> having index i; null when the ids are not all such keys. With it
    /// the catalog groups the ids by key in passes of bounded size instead of noting every point as it passes.
    /// </summary>
    public ReadOnlyMemory<ulong>? PointKeys { get; init; }

    /// <summary>The plan's <see cref="Planning.SweepPlan.DefinitionHash"/> (null: workers plan the sweep in full).</summary>
    public string? DefinitionHash { get; init; }

    /// <summary>Number of distinct chunks among <see cref="Points"/>, when the caller knows it (else counted from the points).</summary>
    public int? ChunkCount { get; init; }
}

/// <summary>A read-only list whose items are made from their index when read.</summary>
public sealed class ComputedList<T> : IReadOnlyList<T>
{
    private readonly Func<int, T> _item;

    public ComputedList(int count, Func<int, T> item)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(count);
        Count = count;
        _item = item;
    }

    public int Count { get; }

    public T this[int index] => (uint)index < (uint)Count ? _item(index) : throw new ArgumentOutOfRangeException(nameof(index));

    public IEnumerator<T> GetEnumerator()
    {
        for (var i = 0; i < Count; i++)
        {
            yield return _item(i);
        }
    }

    System.Collections.IEnumerator System.Collections.IEnumerable.GetEnumerator() => GetEnumerator();
}

/// <summary>One point to register.</summary>
public sealed record NewPoint(string PointId, int Index, string ChunkId, IReadOnlyDictionary<string, object> Parameters);

/// <summary>A point row as the catalog writes it: its parameters already in their JSON text.</summary>
public readonly record struct PointRow(string PointId, long Index, string ChunkId, string ParametersJson);
