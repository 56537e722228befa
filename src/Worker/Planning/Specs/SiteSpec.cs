using LatticeSweep.Engine.Models;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>
/// One basis site. Its mass is <see cref="MassAmu"/> when given (an isotope or an invented mass),
/// otherwise the standard atomic weight of <see cref="Element"/>.
/// </summary>
internal sealed record SiteSpec(string Label, string Kind, Vec3 Position, double? MassAmu, string? Element);
