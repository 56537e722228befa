using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.RealSpace;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// Takes the exact modes of a real-space block one by one (eigenvalue, eigenvector, multiplicity)
/// and turns them into everything a point reports: thermal sums and mean-square displacements (a
/// <see cref="ModeSink"/> whose channels are basis sites then layers, each x direction), the total,
/// per-site and per-layer densities of states, the surface-mode count, the zero modes and the
/// lowest non-zero frequency. The densities go straight into bins when the frequency grid is known,
/// or are kept per mode (a few numbers each) to be binned later on a grid shared by several
/// disorder configurations.
/// </summary>
internal sealed class RealSpaceModes
{
    private readonly RealSpaceLattice _lattice;
    private readonly double[] _mass;
    private readonly int _c;
    private readonly int _r;
    private readonly int _layers;
    private readonly double _threshold;

    // A mirror-symmetric film puts exactly half of many modes' weight on its two surfaces; "at least the
    // threshold" must not depend on the last bit of the eigenvector (a 6-layer film counted 292 or 302 of
    // 1005 modes by round-off alone). Shares agree with the exact value to about 1e-13.
    private const double ShareRoundOff = 1e-9;
    private readonly double _perModeWeight;   // states per cell-equivalent per mode of multiplicity 1
    private readonly double[] _groupShare;    // per basis site, then per layer: sum of |e|^2
    private readonly double[] _channel;       // ModeSink channel values
    private readonly double[] _inverseGroupSites;
    private double[]? _gaussianScratch;
    private readonly List<double> _recordedLambda = [];
    private readonly List<double> _recordedShares = [];
    private readonly List<double> _recordedMultiplicity = [];

    public RealSpaceModes(RealSpaceLattice lattice, SiteProperties properties, ModeSink sink, double zeroTolerance, double surfaceThreshold)
    {
        _lattice = lattice;
        _mass = properties.MassKg;
        _c = lattice.Components;
        _r = lattice.Crystal.Sites;
        _layers = lattice.LayerCount;
        Sink = sink;
        ZeroTolerance = zeroTolerance;
        _threshold = surfaceThreshold;
        _perModeWeight = (double)_r / lattice.AtomCount;
        _groupShare = new double[_r + _layers];
        _channel = new double[(_r + _layers) * _c];
        _inverseGroupSites = new double[_r + _layers];
        for (var b = 0; b < _r; b++)
        {
            _inverseGroupSites[b] = lattice.BasisSites[b] == 0 ? 0 : 1.0 / lattice.BasisSites[b];
        }

        for (var l = 0; l < _layers; l++)
        {
            _inverseGroupSites[_r + l] = 1.0 / lattice.LayerSites[l];
        }
    }

    /// <summary>ModeSink channel masses that make its mean-square displacements site averages (see <see cref="Add"/>).</summary>
    public static double[] ChannelMasses(RealSpaceLattice lattice)
    {
        var masses = new double[(lattice.Crystal.Sites + lattice.LayerCount) * lattice.Components];
        Array.Fill(masses, (double)lattice.Crystal.Sites / lattice.Sites);
        return masses;
    }

    public ModeSink Sink { get; }

    /// <summary>|lambda| at or below this (rad^2/s^2) is a zero mode.</summary>
    public double ZeroTolerance { get; set; }

    /// <summary>Bins for the total (states per cell-equivalent), per basis site and per layer (states per atom); null while recording.</summary>
    public FrequencyGrid? Grid { get; private set; }

    public double[] Total { get; private set; } = [];

    public double[] Partial { get; private set; } = [];

    public double[] LayerDensity { get; private set; } = [];

    public double ZeroModes { get; private set; }

    public double SurfaceModes { get; private set; }

    public double NonZeroModes { get; private set; }

    /// <summary>Lowest eigenvalue above the zero modes (rad^2/s^2), +Infinity when none.</summary>
    public double LowestNonZeroLambda { get; private set; } = double.PositiveInfinity;

    public bool IsRecording => Grid is null;

    /// <summary>Starts binning into <paramref name="grid"/> (also what was recorded so far).</summary>
    public void BinInto(FrequencyGrid grid)
    {
        Grid = grid;
        Total = new double[grid.Bins];
        Partial = new double[_r * grid.Bins];
        LayerDensity = new double[_layers * grid.Bins];
        var groups = _r + _layers;
        for (var k = 0; k < _recordedLambda.Count; k++)
        {
            Deposit(_recordedLambda[k], _recordedMultiplicity[k], System.Runtime.InteropServices.CollectionsMarshal.AsSpan(_recordedShares).Slice(k * groups, groups));
        }

        _recordedLambda.Clear();
        _recordedShares.Clear();
        _recordedMultiplicity.Clear();
    }

    /// <summary>
    /// One mode from its |e_i|^2. The ModeSink gets, per channel (group g, direction a), the average
    /// over the group's block sites of |e_sa|^2 / m_s; with weight = multiplicity r / atoms and channel
    /// mass r / block sites its sum is the group's mean-square displacement.
    /// </summary>
    public void AddSquares(double lambda, ReadOnlySpan<double> squares, double multiplicity)
    {
        Array.Clear(_groupShare);
        Array.Clear(_channel);
        var c = _c;
        for (var s = 0; s < _lattice.Sites; s++)
        {
            var b = _lattice.BasisOf[s];
            var l = _layers > 0 ? _r + _lattice.Layer[s] : -1;
            var inverseMass = 1.0 / _mass[s];
            var share = 0.0;
            for (var a = 0; a < c; a++)
            {
                var e2 = squares[(s * c) + a];
                share += e2;
                var scaled = e2 * inverseMass;
                _channel[(b * c) + a] += scaled;
                if (l >= 0)
                {
                    _channel[(l * c) + a] += scaled;
                }
            }

            _groupShare[b] += share;
            if (l >= 0)
            {
                _groupShare[l] += share;
            }
        }

        for (var g = 0; g < _r + _layers; g++)
        {
            for (var a = 0; a < c; a++)
            {
                _channel[(g * c) + a] *= _inverseGroupSites[g];
            }
        }

        if (Math.Abs(lambda) <= ZeroTolerance)
        {
            ZeroModes += multiplicity;
        }
        else
        {
            NonZeroModes += multiplicity;
            if (lambda > 0)
            {
                LowestNonZeroLambda = Math.Min(LowestNonZeroLambda, lambda);
                Sink.Add(Math.Sqrt(lambda), multiplicity * _perModeWeight, _channel);
            }

            if (_layers > 0 && _groupShare[_r] >= _threshold - ShareRoundOff)
            {
                SurfaceModes += multiplicity;
            }
        }

        var clamped = Math.Abs(lambda) <= ZeroTolerance ? 0.0 : lambda;
        if (Grid is null)
        {
            _recordedLambda.Add(clamped);
            _recordedMultiplicity.Add(multiplicity);
            _recordedShares.AddRange(_groupShare);
        }
        else
        {
            Deposit(clamped, multiplicity, _groupShare);
        }
    }

    /// <summary>Gaussian width (THz) of each mode in the densities; 0 = exact histogram.</summary>
    public double GaussianSigmaThz { get; init; }

    private void Deposit(double lambda, double multiplicity, ReadOnlySpan<double> shares)
    {
        var grid = Grid!.Value;
        var thz = ModeSolver.SignedThz(lambda);
        var weight = multiplicity * _perModeWeight;
        var images = (double)_lattice.ImagesPerSite;
        if (GaussianSigmaThz > 0)
        {
            Span<double> siteWeights = stackalloc double[_r];
            for (var b = 0; b < _r; b++)
            {
                siteWeights[b] = shares[b];
            }

            GaussianBroadening.Deposit(thz, weight, GaussianSigmaThz, grid, Total, Partial, siteWeights);
            if (_layers > 0)
            {
                var layerWeights = new double[_layers];
                for (var l = 0; l < _layers; l++)
                {
                    layerWeights[l] = shares[_r + l] / (images * _lattice.LayerSites[l]);
                }

                _gaussianScratch ??= new double[grid.Bins];
                GaussianBroadening.Deposit(thz, multiplicity, GaussianSigmaThz, grid, _gaussianScratch, LayerDensity, layerWeights);
            }

            return;
        }

        var bin = grid.BinOf(thz);
        Total[bin] += weight;
        for (var b = 0; b < _r; b++)
        {
            Partial[(b * grid.Bins) + bin] += weight * shares[b];
        }

        // Per atom of the layer: multiplicity / (images x layer block sites) x the layer's share.
        for (var l = 0; l < _layers; l++)
        {
            LayerDensity[(l * grid.Bins) + bin] += multiplicity * shares[_r + l] / (images * _lattice.LayerSites[l]);
        }
    }
}
