namespace LatticeSweep.Engine.Results;

/// <summary>
/// One distinct mode frequency of a finite crystal and how many modes share it; for a disordered
/// sample, of one random configuration (0-based), since each configuration is a crystal of its own.
/// </summary>
public sealed record ModeLevel(double FrequencyThz, long Multiplicity, int? Configuration = null);
