namespace LatticeSweep.Worker.Queue;

/// <summary>
/// Bounded retries with doubling backoff for transient I/O faults: by default 3 retries after the
/// first try, waiting 0.5 s, 1 s and 2 s. Anything that is not an I/O fault is not retried.
/// </summary>
public sealed record RetryPolicy(int Retries, TimeSpan FirstDelay)
{
    public static RetryPolicy Default { get; } = new(3, TimeSpan.FromSeconds(0.5));

    /// <summary>True for the faults worth another try: I/O errors (disk, network file system).</summary>
    public static bool IsTransient(Exception ex) => ex is IOException or UnauthorizedAccessException;

    public TimeSpan DelayBefore(int retry) => FirstDelay * Math.Pow(2, retry - 1);

    /// <summary>Runs <paramref name="action"/>, retrying transient faults; <paramref name="onRetry"/> is told before each wait.</summary>
    public async Task<T> RunAsync<T>(Func<Task<T>> action, TimeProvider time, Action<int, TimeSpan, Exception> onRetry, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(action);
        for (var retry = 1; ; retry++)
        {
            try
            {
                return await action().ConfigureAwait(false);
            }
            catch (Exception ex) when (IsTransient(ex) && retry <= Retries)
            {
                var delay = DelayBefore(retry);
                onRetry(retry, delay, ex);
                await Task.Delay(delay, time, ct).ConfigureAwait(false);
            }
        }
    }
}
