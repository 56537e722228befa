using System.Collections.Immutable;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Solving;

/// <summary>A labelled corner of a dispersion path, in reduced coordinates (units of the reciprocal vectors).</summary>
public sealed record PathCorner(string Label, Vec3 Reduced);

/// <summary>A polyline through reciprocal space, sampled with a fixed number of points per segment.</summary>
public sealed record DispersionPath(ImmutableArray<PathCorner> Corners, int PointsPerSegment);
