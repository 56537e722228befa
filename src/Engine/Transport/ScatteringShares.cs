namespace LatticeSweep.Engine.Transport;

/// <summary>
/// The share of each channel in the scattering that limits kappa at the reference temperature:
/// sum over modes of (mode's kappa contribution) x (channel rate / total rate), over kappa. The
/// shares of the channels that are on add up to 1; a channel that is off has share 0. NaN when
/// kappa is zero or unbounded.
/// </summary>
public sealed record ScatteringShares(double Boundary, double PointDefect, double Umklapp, double Constant)
{
    public static ScatteringShares Undefined { get; } = new(double.NaN, double.NaN, double.NaN, double.NaN);
}
