namespace LatticeSweep.Worker.Queue;

/// <summary>
/// The reason of a file-system fault in words that are the same for every file it hit, so that
/// <c>status</c> groups the failed points of a full disk under one reason.
/// </summary>
public static class IoFaultText
{
    public static string Describe(Exception ex)
    {
        ArgumentNullException.ThrowIfNull(ex);
        var message = ex.Message;

        // .NET on Unix words an errno fault as "<system text> : '<path>'": drop the file name.
        var at = message.LastIndexOf(" : '", StringComparison.Ordinal);
        if (at > 0 && message.EndsWith('\''))
        {
            message = message[..at];
        }

        return ex.HResult switch
        {
            28 => $"the disk is full ({message})",
            30 => $"the file system is read-only ({message})",
            122 => $"the disk quota is used up ({message})",
            _ when ex is UnauthorizedAccessException => $"permission denied ({message})",
            _ => message,
        };
    }
}
