using LatticeSweep.Engine.Errors;

namespace LatticeSweep.Engine.Solving;

/// <summary>Checks <see cref="SolveOptions"/> and reports every bad value with its key.</summary>
internal static class OptionsValidation
{
    public const int MaxDosBins = 100_000;

    public static void Check(SolveOptions options)
    {
        var problems = Problems(options);
        if (problems.Count > 0)
        {
            throw new ModelException(problems);
        }
    }

    /// <summary>Every bad value, without throwing.</summary>
    public static List<ModelProblem> Problems(SolveOptions options)
    {
        var problems = new List<ModelProblem>();
        for (var i = 0; i < options.TemperaturesK.Length; i++)
        {
            var t = options.TemperaturesK[i];
            if (!double.IsFinite(t) || t < 0)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, $"output.temperatures_k[{i}]", $"temperatures must be finite and >= 0 K, got {Guard.Show(t)}"));
            }
        }

        if (!double.IsFinite(options.ReferenceTemperatureK) || options.ReferenceTemperatureK < 0)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "output.reference_temperature_k", $"must be finite and >= 0 K, got {Guard.Show(options.ReferenceTemperatureK)}"));
        }

        if (options.DosBins < 1 || options.DosBins > MaxDosBins)
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "output.dos_bins", $"must be in [1, {MaxDosBins}], got {options.DosBins}"));
        }

        if (options.DosMethod == DosMethod.Gaussian && (!double.IsFinite(options.GaussianSigmaThz) || options.GaussianSigmaThz <= 0))
        {
            problems.Add(new(ModelProblemKind.OutOfRange, "output.gaussian_sigma_thz", $"must be finite and > 0 THz, got {Guard.Show(options.GaussianSigmaThz)}"));
        }

        if (options.Dispersion is { } path)
        {
            if (path.Corners.Length < 2)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, "output.dispersion.path", "a dispersion path needs at least two corners"));
            }

            if (path.PointsPerSegment < 1 || path.PointsPerSegment > 10_000)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, "output.dispersion.points_per_segment", $"must be in [1, 10000], got {path.PointsPerSegment}"));
            }
        }

        return problems;
    }
}
