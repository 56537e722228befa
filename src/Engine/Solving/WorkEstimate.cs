namespace LatticeSweep.Engine.Solving;

/// <summary>
/// Work and memory a solve will need, estimated before it starts. <see cref="FlopEstimate"/> is
/// about the floating-point operations of the eigen-solves (about 10 n^3 per solve of an n x n matrix).
/// </summary>
public sealed record WorkEstimate(long EigenSolves, int MatrixSize, double FlopEstimate, long PeakBytes);
