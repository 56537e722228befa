using LatticeSweep.Engine.Builders;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Elastic;

/// <summary>
/// Least-squares fit of the bond-stretch and bond-bend constants of a tetrahedral (diamond or
/// zinc-blende) valence force field to C11, C12, C44. The elastic constants of the model are
/// computed from its own long waves, internal strain included, and are homogeneous of degree one
/// in the two constants: so along each ratio t = bend / (stretch + bend) the best overall scale is
/// a linear least-squares step, and the ratio is found by a scan and golden-section search. With a
/// bending term C12 != C44 is within reach (central springs alone force C12 = C44); what the two
/// constants cannot meet shows in the residual.
/// </summary>
public static class BondBendingFit
{
    private const int ScanPoints = 41;

    /// <param name="cellMassAmu">Mass of the two-site cell (for the density of the Christoffel sound speeds).</param>
    public static ElasticFitResult Fit(TetrahedralStructure structure, double constantNm, double cellMassAmu, CubicElasticConstants target)
    {
        ArgumentNullException.ThrowIfNull(target);
        Guard.PositiveFinite(constantNm, "model.tetrahedral.constant_nm", "the lattice constant");
        Guard.PositiveFinite(target.C11Gpa, "model.tetrahedral.c11_gpa", "C11");
        Guard.Finite(target.C12Gpa, "model.tetrahedral.c12_gpa", "C12");
        Guard.PositiveFinite(target.C44Gpa, "model.tetrahedral.c44_gpa", "C44");
        double[] goal = [target.C11Gpa, target.C12Gpa, target.C44Gpa];

        // Unit model: stretch 1 - t, bend t (N/m); C(t) in GPa per N/m of overall scale.
        double[]? Unit(double t)
        {
            var model = TetrahedralModelBuilder.Build(new TetrahedralModelSpec(structure, constantNm, 28, 28, 1 - t, t));
            var c = LongWaveElasticity.Cubic(CompiledCrystal.From(model));
            return c is null ? null : [c.C11Gpa, c.C12Gpa, c.C44Gpa];
        }

        (double Scale, double Residual, double[] C)? Evaluate(double t)
        {
            if (Unit(t) is not { } c)
            {
                return null;
            }

            var scale = Dot(c, goal) / Dot(c, c);
            if (scale <= 0)
            {
                return null;
            }

            var fitted = c.Select(x => x * scale).ToArray();
            var residual = Math.Sqrt(fitted.Zip(goal, (x, y) => (x - y) * (x - y)).Sum() / Dot(goal, goal));
            return (scale, residual, fitted);
        }

        // t in (0, 1): both constants positive; the ends themselves are floppy or shear-free.
        var best = -1;
        var ts = Enumerable.Range(0, ScanPoints).Select(k => 0.001 + 0.998 * k / (ScanPoints - 1)).ToArray();
        var residuals = ts.Select(t => Evaluate(t)?.Residual ?? double.PositiveInfinity).ToArray();
        for (var k = 0; k < ScanPoints; k++)
        {
            if (best < 0 || residuals[k] < residuals[best])
            {
                best = k;
            }
        }

        if (!double.IsFinite(residuals[best]))
        {
            throw Guard.Single(ModelProblemKind.OutOfRange, "model.tetrahedral", "no positive stretch and bend constants reproduce these elastic constants even roughly; check C11, C12, C44");
        }

        var lo = ts[Math.Max(0, best - 1)];
        var hi = ts[Math.Min(ScanPoints - 1, best + 1)];
        var g = (Math.Sqrt(5) - 1) / 2;
        double R(double t) => Evaluate(t)?.Residual ?? double.PositiveInfinity;
        var x1 = hi - g * (hi - lo);
        var x2 = lo + g * (hi - lo);
        var (f1, f2) = (R(x1), R(x2));
        while (hi - lo > 1e-10)
        {
            if (f1 <= f2)
            {
                (hi, x2, f2) = (x2, x1, f1);
                x1 = hi - g * (hi - lo);
                f1 = R(x1);
            }
            else
            {
                (lo, x1, f1) = (x1, x2, f2);
                x2 = lo + g * (hi - lo);
                f2 = R(x2);
            }
        }

        var tBest = (lo + hi) / 2;
        if (Evaluate(tBest) is null)
        {
            tBest = ts[best];
        }

        var final = Evaluate(tBest)!.Value;
        var reproduced = new CubicElasticConstants(final.C[0], final.C[1], final.C[2]);
        var density = cellMassAmu * PhysicalConstants.AtomicMassKg / Math.Pow(constantNm * PhysicalConstants.MetresPerNm, 3) * 4;
        return new ElasticFitResult(
            NearestNPerM: final.Scale * (1 - tBest),
            NextNearestNPerM: 0,
            Given: target,
            Reproduced: reproduced,
            RelativeResidual: final.Residual,
            DensityKgPerM3: density,
            SoundSpeeds: [.. ElasticSpringFit.ChristoffelSpeeds(reproduced, density)])
        {
            BendNPerM = final.Scale * tBest,
        };
    }

    private static double Dot(double[] a, double[] b) => a.Zip(b, (x, y) => x * y).Sum();
}
