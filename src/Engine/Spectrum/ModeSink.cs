using LatticeSweep.Engine.Thermal;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// Collects modes (exact modes of a finite crystal, or density-of-states bins of a bulk mesh) into
/// thermal sums, frequency moments and mean-square displacements. Weights are states per cell.
/// Zero and negative frequencies never enter: the caller counts them.
/// </summary>
internal sealed class ModeSink
{
    private readonly double[] _temperaturesK;
    private readonly ThermalSums[] _sums;
    private readonly double[]? _msd; // [t * channels + c], m^2
    private readonly double[] _massKgByChannel;
    private readonly int _channels;

    public ModeSink(double[] temperaturesK, int channels, double[] massKgByChannel, bool displacements)
    {
        _temperaturesK = temperaturesK;
        _sums = new ThermalSums[temperaturesK.Length];
        _channels = channels;
        _massKgByChannel = massKgByChannel;
        _msd = displacements ? new double[temperaturesK.Length * channels] : null;
    }

    public double StatesCounted { get; private set; }
    public double SumInverseOmegaSquared { get; private set; }
    public double SumLnOmega { get; private set; }
    public double SumOmegaSquared { get; private set; }

    public bool WantsChannelFractions => _msd is not null;

    /// <summary>Adds a mode of angular frequency omega with weight (states per cell) and its channel fractions (sum 1).</summary>
    public void Add(double omega, double weight, ReadOnlySpan<double> channelFractions)
    {
        if (!(omega > 0) || weight == 0)
        {
            return;
        }

        StatesCounted += weight;
        SumInverseOmegaSquared += weight / (omega * omega);
        SumLnOmega += weight * Math.Log(omega);
        SumOmegaSquared += weight * omega * omega;
        for (var t = 0; t < _temperaturesK.Length; t++)
        {
            ModeThermodynamics.Accumulate(omega, weight, _temperaturesK[t], ref _sums[t]);
        }

        if (_msd is null || channelFractions.IsEmpty)
        {
            return;
        }

        // <u^2> = hbar / (2 m omega) coth(x / 2) per mode and unit weight (Maradudin et al., Theory of
        // Lattice Dynamics in the Harmonic Approximation, 2nd ed., ch. 5; common practice).
        for (var t = 0; t < _temperaturesK.Length; t++)
        {
            var coth = CothHalf(omega, _temperaturesK[t]);
            var baseFactor = weight * PhysicalConstants.HbarJS / (2.0 * omega) * coth;
            var row = t * _channels;
            for (var c = 0; c < _channels; c++)
            {
                var f = channelFractions[c];
                if (f != 0)
                {
                    _msd[row + c] += baseFactor * f / _massKgByChannel[c];
                }
            }
        }
    }

    public ThermalSums Sums(int temperatureIndex) => _sums[temperatureIndex];

    /// <summary>Mean-square displacement (m^2) at temperature index t for channel c, or NaN when not collected.</summary>
    public double Msd(int t, int c) => _msd is null ? double.NaN : _msd[t * _channels + c];

    private static double CothHalf(double omega, double temperatureK)
    {
        if (temperatureK <= 0)
        {
            return 1.0;
        }

        var x = PhysicalConstants.HbarJS * omega / (PhysicalConstants.BoltzmannJPerK * temperatureK);
        if (x > 40)
        {
            return 1.0;
        }

        // coth(x/2) = 1 + 2 / (e^x - 1)
        return 1.0 + 2.0 / Numerics.SmallFunctions.ExpM1(x);
    }
}
