namespace LatticeSweep.Engine.Errors;

/// <summary>
/// A model that cannot be solved as given. Carries every problem found, each with its location,
/// so a user fixes them all in one go.
/// </summary>
public sealed class ModelException : Exception
{
    public ModelException(IReadOnlyList<ModelProblem> problems)
        : base(Format(problems))
    {
        Problems = problems;
    }

    public ModelException()
        : this([])
    {
    }

    public ModelException(string message)
        : base(message)
    {
        Problems = [];
    }

    public ModelException(string message, Exception innerException)
        : base(message, innerException)
    {
        Problems = [];
    }

    public IReadOnlyList<ModelProblem> Problems { get; }

    /// <summary>The kind of the first problem (most callers look at one).</summary>
    public ModelProblemKind? Kind => Problems.Count > 0 ? Problems[0].Kind : null;

    private static string Format(IReadOnlyList<ModelProblem> problems) =>
        problems.Count switch
        {
            0 => "the model is invalid",
            1 => problems[0].ToString(),
            _ => string.Join(Environment.NewLine, problems.Select(p => p.ToString())),
        };
}
