using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// The two hooks the solver facade calls: compute the conductivity before the spectrum pass (so bad
/// conductivity options fail before any long work), and attach it to the finished result.
/// </summary>
internal static class ConductivityStep
{
    public static ConductivityResult? ComputeIfAsked(CrystalModel model, CompiledCrystal crystal, Sample sample, SolveOptions options, CancellationToken ct) =>
        options.Conductivity is null ? null : ConductivityCalculator.Compute(model, crystal, sample, options, ct);

    public static PointResult Attach(PointResult result, ConductivityResult? conductivity) =>
        conductivity is null
            ? result
            : result with
            {
                Conductivity = conductivity,
                Summary = result.Summary with
                {
                    KappaWPerMK = Defined(conductivity.AtReference.KappaWPerMK),
                    KappaMinWPerMK = Defined(conductivity.KappaMinWPerMK),
                },
            };

    /// <summary>The conductivity pass marks an undefined number NaN; the summary says it with null.</summary>
    private static double? Defined(double value) => double.IsNaN(value) ? null : value;
}
