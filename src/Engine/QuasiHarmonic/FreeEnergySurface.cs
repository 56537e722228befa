using System.Globalization;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Units;
using MathNet.Numerics;

namespace LatticeSweep.Engine.QuasiHarmonic;

/// <summary>
/// F(V, T) = E_static(V) + F_vib(V, T) near the static minimum and its minimum over V at each
/// temperature. E_static is evaluated exactly (lattice sums, analytic derivatives); F_vib, ln S_vib and
/// ln Cv (<see cref="PositiveFit"/>), known at the solved volumes, are polynomials in V over a window of at
/// most seven volumes around the first local minimum of the sampled F. ln S and ln Cv are least-squares
/// polynomials in y = V/V0 - 1 (quartic from six volumes, cubic from five, quadratic from four). F_vib, whose
/// second derivative is B_T's, is the polynomial through every volume of the window
/// (<see cref="VolumeInterpolant"/>) where it is an exact mode sum (a finite crystal: a sum of a smooth function
/// over every eigenvalue is smooth in V, as the trace of a matrix function). A bulk mesh's F_vib comes from its
/// density of states, whose simplices, bins and long-wave regions change with the frequencies and leave a
/// volume-to-volume jitter (1e-7 to 1e-6 of F_vib) that V F'' amplifies, and whose linear simplices bend F_vib(V)
/// systematically as well: there F_vib is the interpolant of the mesh's plain mode sums
/// (<see cref="Solving.MeshModeSums"/>, the same q points and weights at every volume: smooth) plus the least-squares
/// straight line through the DOS integral's difference from them, which keeps the integral's level and slope
/// but takes F'' from the sums (B_T at 800-1800 K 3-5 times closer to a converged reference than the quartic of the
/// DOS values; a quadratic difference brought the error back: docs/outside-checks.md, Round 29). The minimum is searched only inside the window: it is never extrapolated. Then B_T = V F'', alpha_V = (dS/dV)_T / B_T,
/// the thermal Grueneisen parameter V (dS/dV)_T / Cv, which is exactly the Cv-weighted mean of the
/// mode parameters -d ln omega / d ln V, and Cp = Cv + alpha_V^2 B_T V T (Wallace, Thermodynamics
/// of Crystals, ch. 1-2; Ashcroft and Mermin, ch. 25; from memory).
/// </summary>
internal sealed class FreeEnergySurface
{
    private const int Window = 7;

    private readonly StaticEnergyCurve _static;
    private readonly VolumeSample[] _volumes;
    private readonly double _v0;
    private readonly double _givenConstantNm;
    private readonly double _staticScale;
    private readonly bool _unstableBelow;
    private readonly bool _unstableAbove;
    private readonly bool _exactModeSums;
    private readonly bool _meshSums;
    private readonly double[] _staticEnergies;
    private readonly Dictionary<int, (Polynomial Fit, VolumeInterpolant? Free, Polynomial? Line)> _projectors = [];

    /// <param name="usable">The contiguous run of usable volumes, ascending (at least four).</param>
    /// <param name="unstableBelow">A volume just below the run was solved and was unstable.</param>
    /// <param name="unstableAbove">A volume just above the run was solved and was unstable.</param>
    /// <param name="exactModeSums">F_vib is an exact mode sum at every volume (a finite crystal), smooth in V: interpolated, not fitted.</param>
    public FreeEnergySurface(StaticEnergyCurve staticCurve, IReadOnlyList<VolumeSample> usable, double staticScale, double givenConstantNm, bool unstableBelow, bool unstableAbove, bool exactModeSums)
    {
        _static = staticCurve;
        _volumes = [.. usable];
        _staticScale = staticScale;
        _v0 = staticCurve.MeasureAt(staticScale);
        _givenConstantNm = givenConstantNm;
        _unstableBelow = unstableBelow;
        _unstableAbove = unstableAbove;
        _exactModeSums = exactModeSums;
        _meshSums = !exactModeSums && _volumes.All(v => v.MeshSums is not null);

        // The same at every temperature: evaluated once.
        _staticEnergies = [.. _volumes.Select(v => staticCurve.At(ScaleOf(v.CellMeasure)).Energy)];
    }

    /// <summary>Where the minimum of F lies against the sampled volumes.</summary>
    public enum Side
    {
        Inside,
        Above,
        Below,
        NotConvex,
    }

    private int Dimension => _static.Dimension;

    /// <summary>Linear strain of the largest (smallest) usable volume from the static minimum.</summary>
    public double TopStrain => ScaleOf(_volumes[^1].CellMeasure) / _staticScale - 1;

    public double BottomStrain => ScaleOf(_volumes[0].CellMeasure) / _staticScale - 1;

    public (ExpansionRow Row, Side Side) Minimise(int t, double temperatureK)
    {
        var row = new ExpansionRow { TemperatureK = temperatureK };

        // A window of volumes around the first local minimum of the sampled F, counted from the smallest
        // volume: the state that grows continuously out of the static minimum. At high temperature F can
        // fall again beyond a maximum, towards the instability; that is not the crystal's state.
        var total = _volumes.Select((v, k) => _staticEnergies[k] + v.FreeEnergyJ[t]).ToArray();
        var lowest = 0;
        while (lowest + 1 < total.Length && total[lowest + 1] < total[lowest])
        {
            lowest++;
        }

        var size = Math.Min(Window, _volumes.Length);
        var first = Math.Clamp(lowest - size / 2, 0, _volumes.Length - size);
        var window = _volumes[first..(first + size)];
        var degree = size switch { >= 6 => 4, 5 => 3, _ => 2 };
        // The window's volumes are the same at every temperature: its projectors are made once.
        if (!_projectors.TryGetValue(first, out var projectors))
        {
            var y = window.Select(v => v.CellMeasure / _v0 - 1).ToArray();
            projectors = (new Polynomial(y, degree),
                _exactModeSums || _meshSums ? new VolumeInterpolant(window.Select(v => v.CellMeasure).ToArray()) : null,
                _meshSums ? new Polynomial(y, 1) : null);
            _projectors[first] = projectors;
        }

        var (fit, free, line) = projectors;

        // F_vib: a finite crystal's values interpolated; a bulk mesh's plain mode sums interpolated (smooth in V)
        // plus the straight line fitted to the DOS integral's difference from them (its level and slope, not its jitter).
        var f = free is null
            ? fit.Coefficients(window.Select(v => v.FreeEnergyJ[t]))
            : free.Coefficients(window.Select(v => line is null ? v.FreeEnergyJ[t] : v.MeshSums!.FreeEnergyJ[t]));
        var offset = line?.Coefficients(window.Select(v => v.FreeEnergyJ[t] - v.MeshSums!.FreeEnergyJ[t]));

        // F_vib and its first two derivatives in V at v, from the fit (in y) or the interpolant (in V) and the line.
        double Vibrational(double v, int k) => free is null
            ? Polynomial.Derivative(f, v / _v0 - 1, k) / (k switch { 0 => 1, 1 => _v0, _ => _v0 * _v0 })
            : free.Derivative(f, v, k) + (offset is null ? 0 : Polynomial.Derivative(offset, v / _v0 - 1, k) / (k switch { 0 => 1, 1 => _v0, _ => _v0 * _v0 }));

        var s = PositiveFit.Of(fit, window.Select(v => v.EntropyJPerK[t]));
        var c = PositiveFit.Of(fit, window.Select(v => v.HeatCapacityJPerK[t]));

        // F'(V) and F''(V): the static part exact (one lattice sum gives both), the vibrational part from the fit or interpolant.
        (double Slope, double Curvature) Derivatives(double v)
        {
            var (first, second) = _static.VolumeDerivatives(ScaleOf(v));
            return (first + Vibrational(v, 1), second + Vibrational(v, 2));
        }

        var (lo, hi) = (window[0].CellMeasure, window[^1].CellMeasure);
        if (Derivatives(hi).Slope < 0)
        {
            return first + size == _volumes.Length
                ? (row with { Breakdown = _unstableAbove ? RunawayText(hi) : AboveText(hi) }, Side.Above)
                : (row with { Breakdown = NotConvexText }, Side.NotConvex);
        }

        if (Derivatives(lo).Slope > 0)
        {
            return first == 0
                ? (row with { Breakdown = BelowText(lo) }, Side.Below)
                : (row with { Breakdown = NotConvexText }, Side.NotConvex);
        }

        // F' rises through zero between lo and hi: Newton's method from the lowest sampled F, kept inside a
        // bracket that shrinks at every step (bisection where a Newton step would leave it), to round-off.
        var vStar = Math.Clamp(_volumes[lowest].CellMeasure, lo, hi);
        var curvature = 0.0;
        for (var i = 0; i < 100; i++)
        {
            (var slope, curvature) = Derivatives(vStar);
            if (slope > 0)
            {
                hi = vStar;
            }
            else
            {
                lo = vStar;
            }

            var next = curvature > 0 ? vStar - slope / curvature : double.NaN;
            if (Math.Abs(next - vStar) <= 1e-13 * vStar || hi - lo <= 1e-14 * hi)
            {
                // Converged: the last step is round-off (it may touch the bracket end vStar just became).
                vStar = double.IsNaN(next) ? vStar : Math.Clamp(next, lo, hi);
                curvature = Derivatives(vStar).Curvature;
                break;
            }

            vStar = next > lo && next < hi ? next : (lo + hi) / 2;
        }

        var yStar = vStar / _v0 - 1;
        if (curvature <= 0)
        {
            return (row with { Breakdown = NotConvexText }, Side.NotConvex);
        }

        var bulk = vStar * curvature;
        var dSdV = s.Slope(yStar) / _v0;
        var cv = Math.Max(0, c.Value(yStar));
        var alphaV = dSdV / bulk;
        var perMol = PhysicalConstants.AvogadroPerMol / _static.AtomsPerCell;
        var energy = _static.At(ScaleOf(vStar)).Energy + Vibrational(vStar, 0);
        var cp = cv + alphaV * alphaV * bulk * vStar * temperatureK;
        var d = Dimension;
        return (row with
        {
            LatticeConstantNm = _givenConstantNm * ScaleOf(vStar),
            VolumeRatio = vStar / _v0,
            LinearExpansionPerK = alphaV / d,
            VolumeExpansionPerK = alphaV,
            IsothermalBulkModulusGpa = d == 3 ? bulk / PhysicalConstants.PascalPerGpa : null,
            IsothermalBulkModulusNPerM = d == 2 ? bulk : null,
            IsothermalBulkModulusN = d == 1 ? bulk : null,
            CvJPerMolK = cv * perMol,
            CpJPerMolK = cp * perMol,

            // Undefined where no mode is excited (T = 0, or Cv below 1e-12 kB per cell): 0/0.
            Grueneisen = cv > 1e-12 * PhysicalConstants.BoltzmannJPerK * _static.AtomsPerCell ? vStar * dSdV / cv : null,
            FreeEnergyJPerMol = energy * perMol,
        }, Side.Inside);
    }

    private const string NotConvexText = "F(V) has no minimum here: its curvature d2F/dV2 is not positive";

    private string RunawayText(double v) =>
        $"runaway expansion: F(V) still falls where the lattice turns unstable (beyond {Strain(v)} linear strain from the static minimum)";

    private string AboveText(double v) =>
        $"no minimum of F(V) up to {Strain(v)} linear strain from the static minimum (the largest volume sampled): the lattice expands without bound here and the approximation breaks down";

    private string BelowText(double v) => _unstableBelow
        ? $"no minimum of F(V) above the volume where the lattice turns unstable ({Strain(v)} linear strain from the static minimum)"
        : $"no minimum of F(V) down to {Strain(v)} linear strain from the static minimum (the smallest volume sampled)";

    /// <summary>Lattice scale factor (relative to the lattice as given) of cell measure V.</summary>
    private double ScaleOf(double v) => Math.Pow(v / _static.CellMeasure, 1.0 / Dimension);

    private string Strain(double v) =>
        (ScaleOf(v) / _staticScale - 1).ToString("+0.0%;-0.0%", CultureInfo.InvariantCulture);
}

/// <summary>
/// Least-squares polynomial fits of any data at fixed abscissae: the QR solve of the Vandermonde
/// design that MathNet's Fit.Polynomial makes per call, made once for the identity, so each fit is a
/// small matrix-vector product (the quasi-harmonic loop fits three quantities per temperature).
/// </summary>
internal sealed class Polynomial
{
    private readonly double[,] _projector;

    public Polynomial(double[] x, int degree)
    {
        var design = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.Dense(x.Length, degree + 1, (i, j) => Math.Pow(x[i], j));
        _projector = design.QR().Solve(MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.DenseIdentity(x.Length)).ToArray();
    }

    /// <summary>Coefficients, constant first, of the least-squares polynomial through (x, y).</summary>
    public double[] Coefficients(IEnumerable<double> y)
    {
        var values = y.ToArray();
        var p = new double[_projector.GetLength(0)];
        for (var i = 0; i < p.Length; i++)
        {
            for (var k = 0; k < values.Length; k++)
            {
                p[i] += _projector[i, k] * values[k];
            }
        }

        return p;
    }

    /// <summary>The k-th derivative (k = 0, 1, 2) of the polynomial with coefficients p at x.</summary>
    public static double Derivative(double[] p, double x, int k)
    {
        var sum = 0.0;
        for (var i = p.Length - 1; i >= k; i--)
        {
            var factor = k switch { 0 => 1.0, 1 => i, _ => i * (i - 1.0) };
            sum = sum * x + factor * p[i];
        }

        return sum;
    }
}
