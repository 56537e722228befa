namespace LatticeSweep.Worker.JobFiles;

/// <summary>One mistake in a job file, located: file, 1-based line and column (0 when unknown), key path, and what to change.</summary>
public sealed record JobFileProblem(string File, int Line, int Column, string Key, string Message)
{
    /// <summary>Characters of a key path kept in the printed line.</summary>
    public const int MaxKeyChars = 200;

    /// <summary>One line: control characters escaped, an overlong key or message cut (see <see cref="EchoText"/>).</summary>
    public override string ToString()
    {
        var file = EchoText.Escape(File);
        var where = Line > 0 ? $"{file}:{Line}:{Column}" : file;
        var message = EchoText.Cut(Message, EchoText.MaxLineChars);
        return string.IsNullOrEmpty(Key) ? $"{where}: {message}" : $"{where}: {EchoText.Cut(Key, MaxKeyChars)}: {message}";
    }
}
