namespace LatticeSweep.Engine.Models;

/// <summary>
/// One atom of the basis. <see cref="Kind"/> groups sites for springs by shell (usually the element
/// or a user's own label); <see cref="Label"/> names this site in results.
/// </summary>
/// <param name="Label">Unique name of the site within the basis.</param>
/// <param name="Kind">Site kind that shell springs refer to.</param>
/// <param name="Fractional">Position in units of the lattice vectors.</param>
/// <param name="MassAmu">Mass in unified atomic mass units.</param>
public sealed record Site(string Label, string Kind, Vec3 Fractional, double MassAmu);
