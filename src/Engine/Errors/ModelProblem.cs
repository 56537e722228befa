namespace LatticeSweep.Engine.Errors;

/// <summary>One problem in a model: what kind, where (a key path such as <c>sites[2].mass_amu</c>) and what to change.</summary>
public sealed record ModelProblem(ModelProblemKind Kind, string Where, string Message)
{
    public override string ToString() => $"{Where}: {Message}";
}
