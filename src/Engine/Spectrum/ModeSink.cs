using System.Runtime.CompilerServices;
using LatticeSweep.Engine.Thermal;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// Collects modes (exact modes of a finite crystal, or density-of-states bins of a bulk mesh) into
/// thermal sums, frequency moments and mean-square displacements. Weights are states per cell.
/// Zero and negative frequencies never enter: the caller counts them.
/// <para>
/// A caller that knows the top frequency beforehand (the finite crystal's second pass) calls
/// <see cref="PrepareBins"/>: modes then go into <see cref="ChebyshevModeBins"/> and the sums over
/// temperatures are taken once per quadrature point instead of once per mode, to within 1e-12
/// relative of the plain sum. Otherwise every mode is summed at every temperature.
/// </para>
/// </summary>
internal sealed class ModeSink
{
    private readonly double[] _temperaturesK;
    private readonly ThermalSums[] _sums;
    private readonly double[]? _msd; // [t * channels + c], m^2
    private readonly double[] _massKgByChannel;
    private readonly int _channels;
    private ChebyshevModeBins? _bins;
    private int[]? _unbinned;
    private double _sumInverseOmegaSquared;
    private double _sumLnOmega;
    private double _sumOmegaSquared;

    public ModeSink(double[] temperaturesK, int channels, double[] massKgByChannel, bool displacements)
    {
        _temperaturesK = temperaturesK;
        _sums = new ThermalSums[temperaturesK.Length];
        _channels = channels;
        _massKgByChannel = massKgByChannel;
        _msd = displacements ? new double[temperaturesK.Length * channels] : null;
    }

    public double StatesCounted { get; private set; }

    /// <summary>The temperatures (K) the sums are kept for.</summary>
    public ReadOnlySpan<double> TemperaturesK => _temperaturesK;

    public double SumInverseOmegaSquared => Flushed()._sumInverseOmegaSquared;

    public double SumLnOmega => Flushed()._sumLnOmega;

    public double SumOmegaSquared => Flushed()._sumOmegaSquared;

    public bool WantsChannelFractions => _msd is not null;

    /// <summary>True while modes go into bins (between <see cref="PrepareBins"/> and the first read of a sum).</summary>
    internal bool IsBinning => _bins is not null;

    /// <summary>
    /// Announces that no mode above <paramref name="omegaTop"/> (rad/s) will come, out of about
    /// <paramref name="expectedModes"/> modes; the sink then bins them where that is cheaper.
    /// </summary>
    public void PrepareBins(double omegaTop, long expectedModes) =>
        _bins = ChebyshevModeBins.TryCreate(omegaTop, _temperaturesK, expectedModes, _msd is null ? 0 : _channels);

    /// <summary>Adds a mode of angular frequency omega with weight (states per cell) and its channel fractions (sum 1).</summary>
    public void Add(double omega, double weight, ReadOnlySpan<double> channelFractions)
    {
        if (!(omega > 0) || weight == 0)
        {
            return;
        }

        StatesCounted += weight;
        if (_bins is not null && _bins.Add(omega, weight, _msd is null ? default : channelFractions))
        {
            return;
        }

        AddExact(omega, weight, channelFractions);
    }

    /// <summary>
    /// Adds many modes without channel fractions: the same as <see cref="Add"/> for each in turn, up to
    /// round-off where they are binned (<see cref="ChebyshevModeBins.AddMany"/> sums a bin's run of
    /// modes before adding it).
    /// </summary>
    public void AddMany(ReadOnlySpan<double> omegas, ReadOnlySpan<double> weights)
    {
        var bins = _bins;
        var plain = bins is null || _msd is not null;
        var states = StatesCounted;
        for (var i = 0; i < omegas.Length && !plain; i++)
        {
            plain = !(omegas[i] > 0) || weights[i] == 0;
            states += weights[i];
        }

        if (plain)
        {
            for (var i = 0; i < omegas.Length; i++)
            {
                Add(omegas[i], weights[i], default);
            }

            return;
        }

        StatesCounted = states;
        if (_unbinned is null || _unbinned.Length < omegas.Length)
        {
            _unbinned = new int[omegas.Length];
        }

        var unbinned = bins!.AddMany(omegas, weights, _unbinned);
        for (var r = 0; r < unbinned; r++)
        {
            var i = _unbinned[r];
            AddExact(omegas[i], weights[i], default);
        }
    }

    public ThermalSums Sums(int temperatureIndex) => Flushed()._sums[temperatureIndex];

    /// <summary>
    /// Moves the sums at temperature index t towards a plain mesh sum's (<see cref="PeriodicMeshSums"/>): U and Cv become
    /// (1 - w) of these plus w of the given ones, S stays, and F = U - T S moves with U; the zero-point energy stays.
    /// </summary>
    public void BlendPlainSums(int t, double weight, double internalJ, double heatCapacityJPerK)
    {
        if (!(weight > 0))
        {
            return;
        }

        ref var s = ref Flushed()._sums[t];
        var shift = weight * (internalJ - s.Internal);
        s.Internal += shift;
        s.Free += shift;
        s.HeatCapacity = ((1 - weight) * s.HeatCapacity) + (weight * heatCapacityJPerK);
    }

    /// <summary>
    /// Puts the zero-point energy of every temperature's sums at <paramref name="zeroPointJ"/> (<see cref="GammaCellSums"/>),
    /// U and F moving with it (both contain it once); S and Cv stay.
    /// </summary>
    public void ReplaceZeroPoint(double zeroPointJ)
    {
        var sums = Flushed()._sums;
        for (var t = 0; t < sums.Length; t++)
        {
            var shift = zeroPointJ - sums[t].ZeroPoint;
            sums[t].ZeroPoint = zeroPointJ;
            sums[t].Internal += shift;
            sums[t].Free += shift;
        }
    }

    /// <summary>
    /// Moves S at temperature index t towards a plain mesh sum's (<see cref="GammaCellSums"/>): (1 - w) of this plus w of
    /// the given one; F = U - T S follows (call after <see cref="BlendPlainSums"/>, whose U it keeps).
    /// </summary>
    public void BlendPlainEntropy(int t, double weight, double entropyJPerK)
    {
        if (!(weight > 0))
        {
            return;
        }

        ref var s = ref Flushed()._sums[t];
        var entropy = ((1 - weight) * s.Entropy) + (weight * entropyJPerK);
        s.Free -= _temperaturesK[t] * (entropy - s.Entropy);
        s.Entropy = entropy;
    }

    /// <summary>Mean-square displacement (m^2) at temperature index t for channel c, or NaN when not collected.</summary>
    public double Msd(int t, int c) => _msd is null ? double.NaN : Flushed()._msd![t * _channels + c];

    /// <summary>Turns the binned moments (if any) into sums, once; later adds are summed one by one.</summary>
    private ModeSink Flushed()
    {
        var bins = _bins;
        if (bins is null)
        {
            return this;
        }

        _bins = null;
        bins.ForEachPoint((omega, weight, channelWeights) => AddExact(omega, weight, channelWeights, weightsIncludeFractions: true));
        return this;
    }

    /// <param name="weightsIncludeFractions">The channel values are weights of their own (a quadrature point), not fractions of <paramref name="weight"/>.</param>
    private void AddExact(double omega, double weight, ReadOnlySpan<double> channelFractions, bool weightsIncludeFractions = false)
    {
        _sumInverseOmegaSquared += weight / (omega * omega);
        _sumLnOmega += weight * Math.Log(omega);
        _sumOmegaSquared += weight * omega * omega;
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
            var baseFactor = (weightsIncludeFractions ? 1.0 : weight) * PhysicalConstants.HbarJS / (2.0 * omega) * coth;
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

    [MethodImpl(MethodImplOptions.AggressiveInlining)] // per mode and temperature in AddExact, as dynamic PGO inlined it
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
