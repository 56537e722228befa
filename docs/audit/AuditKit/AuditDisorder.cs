namespace LatticeSweep.Audit;

/// <summary>README `[sample.disorder]`: configurations averaged, their seed, one substitution per substituted basis site.</summary>
internal sealed record AuditDisorder(int Configurations, int Seed, AuditSubstitution[] Substitutions);

/// <summary>One `[[sample.disorder.substitutions]]`: basis site (index and label), substitute mass (amu), concentration, spring factor.</summary>
internal sealed record AuditSubstitution(int Site, string Label, double MassAmu, double Concentration, double SpringFactor)
{
    /// <summary>Substituted atoms among n of the site: the nearest whole number of c n, halves rounded up (README).</summary>
    public int Count(int n) => (int)Math.Floor(Concentration * n + 0.5);
}

/// <summary>README `[output.expansion]`: harmonic volumes and the largest linear strain solved at first.</summary>
internal sealed record AuditExpansion(int Volumes, double LargestStrain, bool Relax);
