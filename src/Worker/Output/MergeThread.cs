using System.Runtime.ExceptionServices;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// Runs one table's merge on a thread of its own that ends with it. Parquet.Net rents its row groups'
/// arrays (up to a few MiB each at <see cref="MergedLayout.RowGroupRows"/> rows) from .NET's shared
/// <c>ArrayPool</c>, which keeps an array of each size per thread that returned one, and gives no way to
/// empty it. With the merge's files read and written through <see cref="InlineStream"/> every step runs
/// on this thread, so one thread's slots hold those arrays while the table is merged, and they are
/// garbage once the thread ends: after a merge on the thread pool, ~68 MiB of them stayed alive to the
/// end of the process (bench/README, rounds 17 and 18).
/// </summary>
internal static class MergeThread
{
    public static T Run<T>(string name, Func<Task<T>> work)
    {
        ArgumentNullException.ThrowIfNull(work);
        T result = default!;
        ExceptionDispatchInfo? failure = null;
        var thread = new Thread(() =>
        {
            try
            {
                result = work().GetAwaiter().GetResult();
            }
            catch (Exception ex)
            {
                failure = ExceptionDispatchInfo.Capture(ex);
            }
        })
        {
            Name = name,
            IsBackground = true,
        };
        thread.Start();
        thread.Join();
        failure?.Throw();
        return result;
    }
}
