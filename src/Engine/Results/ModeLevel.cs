namespace LatticeSweep.Engine.Results;

/// <summary>One distinct mode frequency of a finite crystal and how many modes share it.</summary>
public sealed record ModeLevel(double FrequencyThz, long Multiplicity);
