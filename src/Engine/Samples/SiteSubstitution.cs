namespace LatticeSweep.Engine.Samples;

/// <summary>
/// Random substitution on the sites of one basis label: a fraction <see cref="Concentration"/> of them
/// (the nearest whole number of sites, chosen uniformly) get mass <see cref="MassAmu"/>. Springs of a
/// substituted atom are scaled by <see cref="SpringFactor"/>: a spring between atoms with factors f_i
/// and f_j is multiplied by sqrt(f_i f_j) (the host has f = 1).
/// </summary>
public sealed record SiteSubstitution(string SiteLabel, double MassAmu, double Concentration, double SpringFactor = 1.0);
