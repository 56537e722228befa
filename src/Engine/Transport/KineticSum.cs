using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Running sums of C v_a^2 tau over modes at each temperature (relaxation-time approximation; inside a
/// degenerate set C tau Tr_S(V_a^2), shared out by branch), with the channel shares and the mean-free-path histogram at the reference temperature. A mode with no
/// frequency, no velocity or no heat capacity adds exactly zero (never NaN); a heat-carrying mode
/// that no channel scatters makes that temperature's kappa unbounded.
/// </summary>
internal sealed class KineticSum
{
    private readonly double[] _temperaturesK;
    private readonly int _referenceIndex;
    private readonly int _dimension;
    private readonly ScatteringRates _scattering;
    private readonly double[] _kappa; // [t * 3 + axis], W/K m^2 before dividing by the volume
    private readonly bool[] _unbounded;
    private readonly double[] _channelWeighted = new double[ScatteringRates.ChannelCount];
    private readonly double[] _rates = new double[ScatteringRates.ChannelCount];

    public KineticSum(double[] temperaturesK, int referenceIndex, int dimension, ScatteringRates scattering, bool meanFreePaths)
    {
        _temperaturesK = temperaturesK;
        _referenceIndex = referenceIndex;
        _dimension = dimension;
        _scattering = scattering;
        _kappa = new double[temperaturesK.Length * 3];
        _unbounded = new bool[temperaturesK.Length];
        MeanFreePaths = meanFreePaths ? new MeanFreePathHistogram() : null;
    }

    public ScatteringRates Scattering => _scattering;

    public double[] TemperaturesK => _temperaturesK;

    public MeanFreePathHistogram? MeanFreePaths { get; }

    /// <summary>Adds one mode of angular frequency omega (rad/s) and group velocity v (m/s) counted weight times.</summary>
    public void Add(double omega, Vec3 velocity, double weight) => Add(omega, velocity, Squares(velocity), weight);

    /// <summary>Adds one mode counted a different number of times at each temperature (0 leaves a temperature alone).</summary>
    public void Add(double omega, Vec3 velocity, ReadOnlySpan<double> weightByTemperature) => Add(omega, velocity, Squares(velocity), weightByTemperature);

    /// <summary>
    /// Adds one mode whose heat current's squared velocity components (m^2/s^2) are <paramref name="squares"/>: a branch of a
    /// degenerate set carries (V_a^2)_kk, its share of the set's trace (<see cref="Spectrum.GroupVelocities"/>), while its relaxation
    /// time still follows its own speed |v|.
    /// </summary>
    public void Add(double omega, Vec3 velocity, Vec3 squares, double weight)
    {
        if (weight != 0)
        {
            AddMode(omega, velocity, squares, weight, []);
        }
    }

    /// <summary>As above, counted a different number of times at each temperature.</summary>
    public void Add(double omega, Vec3 velocity, Vec3 squares, ReadOnlySpan<double> weightByTemperature) => AddMode(omega, velocity, squares, 0, weightByTemperature);

    private static Vec3 Squares(Vec3 v) => new(v.X * v.X, v.Y * v.Y, v.Z * v.Z);

    /// <summary>One mode, counted <paramref name="weight"/> times at every temperature, or per temperature when <paramref name="weightByTemperature"/> is given.</summary>
    private void AddMode(double omega, Vec3 velocity, Vec3 squares, double weight, ReadOnlySpan<double> weightByTemperature)
    {
        if (!(omega > 0))
        {
            return;
        }

        var vx2 = squares.X;
        var vy2 = squares.Y;
        var vz2 = squares.Z;
        if (!(vx2 + vy2 + vz2 > 0))
        {
            return; // a standing wave carries no heat
        }

        var speed = Math.Sqrt((velocity.X * velocity.X) + (velocity.Y * velocity.Y) + (velocity.Z * velocity.Z));
        var meanSquare = (_dimension switch { 1 => vx2, 2 => vx2 + vy2, _ => vx2 + vy2 + vz2 }) / _dimension;
        for (var t = 0; t < _temperaturesK.Length; t++)
        {
            var w = weightByTemperature.IsEmpty ? weight : weightByTemperature[t];
            if (w != 0)
            {
                Accumulate(t, omega, speed, vx2, vy2, vz2, meanSquare, w);
            }
        }
    }

    private void Accumulate(int t, double omega, double speed, double vx2, double vy2, double vz2, double meanSquare, double weight)
    {
        var c = ModeHeatCapacity.JPerK(omega, _temperaturesK[t]);
        if (c == 0)
        {
            return;
        }

        var total = _scattering.Fill(omega, speed, _temperaturesK[t], _rates);
        if (!(total > 0))
        {
            _unbounded[t] = true;
            return;
        }

        var ct = weight * c / total;
        _kappa[t * 3] += ct * vx2;
        _kappa[t * 3 + 1] += ct * vy2;
        _kappa[t * 3 + 2] += ct * vz2;
        if (t == _referenceIndex)
        {
            var contribution = ct * meanSquare;
            for (var k = 0; k < _rates.Length; k++)
            {
                _channelWeighted[k] += contribution * _rates[k] / total;
            }

            MeanFreePaths?.Add(speed / total, contribution);
        }
    }

    /// <summary>Marks a temperature's kappa unbounded (long waves that no channel limits).</summary>
    public void MarkUnbounded(int t) => _unbounded[t] = true;

    public bool IsUnbounded(int t) => _unbounded[t];

    /// <summary>Sum for temperature index t along an axis, or +Infinity when unbounded.</summary>
    public double Kappa(int t, int axis) => _unbounded[t] ? double.PositiveInfinity : _kappa[t * 3 + axis];

    /// <summary>Mean over the lattice's directions.</summary>
    public double MeanKappa(int t)
    {
        if (_unbounded[t])
        {
            return double.PositiveInfinity;
        }

        var sum = 0.0;
        for (var a = 0; a < _dimension; a++)
        {
            sum += _kappa[t * 3 + a];
        }

        return sum / _dimension;
    }

    /// <summary>Channel shares at the reference temperature (NaN when kappa there is zero or unbounded).</summary>
    public ScatteringShares Shares()
    {
        if (_referenceIndex < 0 || _unbounded[_referenceIndex])
        {
            return ScatteringShares.Undefined;
        }

        var total = _channelWeighted.Sum();
        if (!(total > 0))
        {
            return ScatteringShares.Undefined;
        }

        return new ScatteringShares(_channelWeighted[0] / total, _channelWeighted[1] / total, _channelWeighted[2] / total, _channelWeighted[3] / total);
    }
}
