namespace LatticeSweep.Worker.Output;

/// <summary>
/// The first rows in plan order, chosen as rows are offered one at a time: by plan index, rows without
/// one (NaN) last, ties by row. Holds at most the rows it keeps (a heap whose top is the worst kept), so
/// the first-load facts need no array of every row for their first page (<see cref="FirstLoadFacts"/>).
/// </summary>
internal sealed class PlanOrderSelection(int keep)
{
    private readonly PriorityQueue<int, (bool Empty, double Key, int Row)> _kept =
        new(Comparer<(bool Empty, double Key, int Row)>.Create((a, b) => b.CompareTo(a)));

    public void Offer(double key, int row)
    {
        var entry = (double.IsNaN(key), double.IsNaN(key) ? 0 : key, row);
        if (_kept.Count < keep)
        {
            _kept.Enqueue(row, entry);
        }
        else if (keep > 0 && _kept.TryPeek(out _, out var worst) && entry.CompareTo(worst) < 0)
        {
            _kept.DequeueEnqueue(row, entry);
        }
    }

    /// <summary>The rows kept, first in plan order first.</summary>
    public int[] Rows()
    {
        var first = new int[_kept.Count];
        for (var k = first.Length - 1; k >= 0; k--)
        {
            first[k] = _kept.Dequeue();
        }

        return first;
    }
}
