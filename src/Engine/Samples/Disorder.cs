using System.Collections.Immutable;

namespace LatticeSweep.Engine.Samples;

/// <summary>
/// Random substitutions on a real-space sample, averaged over <see cref="Configurations"/> random
/// configurations drawn from <see cref="Seed"/> (configuration k uses a generator seeded from both).
/// </summary>
public sealed record Disorder(ImmutableArray<SiteSubstitution> Substitutions, int Configurations, long Seed)
{
    public const int MaxConfigurations = 10_000;
}
