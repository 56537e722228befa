namespace LatticeSweep.Engine.Results;

/// <summary>
/// Sound speeds along one direction from the slopes of the acoustic branches at q = 0, slowest
/// first (in 3D: two transverse and one longitudinal; 1 for scalar or 1D models).
/// </summary>
public sealed record SoundSpeed(string Direction, double[] SpeedsMPerS)
{
    public double Mean => SpeedsMPerS.Length == 0 ? double.NaN : SpeedsMPerS.Average();
}
