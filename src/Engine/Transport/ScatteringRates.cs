namespace LatticeSweep.Engine.Transport;

/// <summary>
/// The scattering channels with every parameter resolved to SI, and Matthiessen's rule: the total
/// rate is the sum of the channel rates. Rates in 1/s; a channel that is off contributes 0.
/// </summary>
internal sealed record ScatteringRates
{
    public const int ChannelCount = 4;

    /// <summary>(1 - p) / ((1 + p) L_eff), 1/m; the boundary rate is this times |v|.</summary>
    public double BoundaryPerMetre { get; init; }

    public bool BoundaryOn { get; init; }

    /// <summary>V0 Gamma / (4 pi v^3), s^3; the point-defect rate is this times omega^4.</summary>
    public double PointDefectCoefficient { get; init; }

    public bool PointDefectOn { get; init; }

    /// <summary>hbar gamma^2 / (M v^2 theta), s/K; the Umklapp rate is this times omega^2 T exp(-theta / 3T).</summary>
    public double UmklappCoefficient { get; init; }

    public double UmklappThetaK { get; init; }

    public bool UmklappOn { get; init; }

    /// <summary>1 / tau, 1/s.</summary>
    public double ConstantRate { get; init; }

    public bool ConstantOn { get; init; }

    /// <summary>Fills rates[channel] for one mode and returns their sum.</summary>
    public double Fill(double omega, double speed, double temperatureK, Span<double> rates)
    {
        rates[0] = BoundaryOn ? BoundaryPerMetre * speed : 0;
        var w2 = omega * omega;
        rates[1] = PointDefectOn ? PointDefectCoefficient * w2 * w2 : 0;
        rates[2] = UmklappOn && temperatureK > 0 ? UmklappCoefficient * w2 * temperatureK * Math.Exp(-UmklappThetaK / (3.0 * temperatureK)) : 0;
        rates[3] = ConstantOn ? ConstantRate : 0;
        return rates[0] + rates[1] + rates[2] + rates[3];
    }

    /// <summary>
    /// Whether the channels keep the long-wave acoustic modes' contribution finite in d dimensions at
    /// T > 0. Near q = 0, C -> kB and the integrand goes as q^(d-1) tau(q): bounded tau (boundary with
    /// p &lt; 1, or a constant time) always converges; Umklapp alone (tau ~ q^-2) converges only in 3D
    /// (2D diverges logarithmically, 1D as 1/q); point defects alone (tau ~ q^-4) never do.
    /// </summary>
    public bool BoundsLongWaves(int dimension, double temperatureK)
    {
        if ((BoundaryOn && BoundaryPerMetre > 0) || (ConstantOn && ConstantRate > 0))
        {
            return true;
        }

        return UmklappOn && dimension >= 3 && UmklappCoefficient > 0
            && Math.Exp(-UmklappThetaK / (3.0 * temperatureK)) > 0;
    }
}
