using System.Collections.Immutable;
using LatticeSweep.Engine.Errors;

namespace LatticeSweep.Engine.Builders;

/// <summary>
/// Masses of the r sites of a layered cell: either r1 sites of mass A followed by r - r1 of mass B,
/// or an explicit sequence repeated until r sites are filled.
/// </summary>
public sealed record MassPattern
{
    private MassPattern(ImmutableArray<double> sequenceAmu, int? firstCount, string description)
    {
        SequenceAmu = sequenceAmu;
        FirstCount = firstCount;
        Description = description;
    }

    public ImmutableArray<double> SequenceAmu { get; }

    /// <summary>r1 for the two-block pattern; null for a repeated sequence.</summary>
    public int? FirstCount { get; }

    public string Description { get; }

    public static MassPattern TwoBlocks(int firstCount, double massAAmu, double massBAmu)
    {
        Guard.PositiveFinite(massAAmu, "model.layers.mass_a_amu", "mass A");
        Guard.PositiveFinite(massBAmu, "model.layers.mass_b_amu", "mass B");
        if (firstCount < 0)
        {
            throw Guard.Single(ModelProblemKind.OutOfRange, "model.layers.count_a", $"the number of A sites must be >= 0, got {firstCount}");
        }

        return new MassPattern([massAAmu, massBAmu], firstCount, $"{firstCount} x A then B");
    }

    public static MassPattern Repeated(IReadOnlyList<double> sequenceAmu)
    {
        ArgumentNullException.ThrowIfNull(sequenceAmu);
        if (sequenceAmu.Count == 0)
        {
            throw Guard.Single(ModelProblemKind.OutOfRange, "model.layers.masses_amu", "the mass sequence needs at least one mass");
        }

        for (var i = 0; i < sequenceAmu.Count; i++)
        {
            Guard.PositiveFinite(sequenceAmu[i], $"model.layers.masses_amu[{i}]", "a mass");
        }

        return new MassPattern([.. sequenceAmu], null, "repeated sequence");
    }

    /// <summary>Mass of site k (0-based) of a cell of r sites.</summary>
    public double MassOf(int k, int r)
    {
        if (FirstCount is { } r1)
        {
            if (r1 > r)
            {
                throw Guard.Single(ModelProblemKind.OutOfRange, "model.layers.count_a", $"the A block ({r1} sites) is longer than the cell ({r} sites)");
            }

            return k < r1 ? SequenceAmu[0] : SequenceAmu[1];
        }

        return SequenceAmu[k % SequenceAmu.Length];
    }
}
