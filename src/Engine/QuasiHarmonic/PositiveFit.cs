namespace LatticeSweep.Engine.QuasiHarmonic;

/// <summary>
/// The least-squares fit over the volumes of S or Cv: of its logarithm when it is positive at every
/// volume, else of the values themselves. Far below a finite crystal's lowest mode S and Cv fall as
/// exp(-hbar omega_min / kT) and change by orders of magnitude across the volumes; a polynomial in
/// the values then holds no relative accuracy (gamma 20 % off, Cv below zero), while ln S and ln Cv
/// stay smooth, nearly linear, in V (omega_min is). Where no mode is excited (T = 0, or values that
/// underflow) the values themselves are fitted: they are zero or too small to matter.
/// </summary>
internal sealed class PositiveFit
{
    private readonly double[] _coefficients;
    private readonly bool _logarithmic;

    private PositiveFit(double[] coefficients, bool logarithmic) => (_coefficients, _logarithmic) = (coefficients, logarithmic);

    public static PositiveFit Of(Polynomial fit, IEnumerable<double> values)
    {
        var y = values.ToArray();
        var logarithmic = y.All(v => v > 0 && double.IsFinite(Math.Log(v)));
        return new PositiveFit(fit.Coefficients(logarithmic ? y.Select(v => Math.Log(v)) : y), logarithmic);
    }

    /// <summary>The fitted quantity at y = V/V0 - 1.</summary>
    public double Value(double y)
    {
        var p = Polynomial.Derivative(_coefficients, y, 0);
        return _logarithmic ? Math.Exp(p) : p;
    }

    /// <summary>Its derivative with respect to y (d/dy exp(p) = exp(p) p').</summary>
    public double Slope(double y) => _logarithmic
        ? Math.Exp(Polynomial.Derivative(_coefficients, y, 0)) * Polynomial.Derivative(_coefficients, y, 1)
        : Polynomial.Derivative(_coefficients, y, 1);
}
