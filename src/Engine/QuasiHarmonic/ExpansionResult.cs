using System.Collections.Immutable;

namespace LatticeSweep.Engine.QuasiHarmonic;

/// <summary>The quasi-harmonic outcome of one point: a row per temperature and how the volumes were sampled.</summary>
public sealed record ExpansionResult
{
    /// <summary>One row per temperature of the thermal table, in its order.</summary>
    public required ImmutableArray<ExpansionRow> Rows { get; init; }

    /// <summary>The row at the reference temperature.</summary>
    public required ExpansionRow AtReference { get; init; }

    /// <summary>Lattice constant at the static minimum, nm.</summary>
    public required double StaticLatticeConstantNm { get; init; }

    /// <summary>Lattice scale factors solved (1 = the lattice as given), ascending.</summary>
    public required ImmutableArray<double> ScalesSolved { get; init; }

    /// <summary>How many of them had a stable spectrum and entered the fit (a contiguous run around the static minimum).</summary>
    public required int VolumesUsed { get; init; }
}
