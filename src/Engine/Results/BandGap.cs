namespace LatticeSweep.Engine.Results;

/// <summary>A frequency range with no modes, between the top of one branch group and the bottom of the next.</summary>
public sealed record BandGap(double LowerThz, double UpperThz)
{
    public double WidthThz => UpperThz - LowerThz;
}
