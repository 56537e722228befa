using System.Collections.Immutable;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;

namespace LatticeSweep.Bench;

/// <summary>Cases (b), (c), (d): one whole point through <see cref="PhononSolver.Solve"/>, end to end.</summary>
internal static class SolveCase
{
    /// <param name="jobDefaults">Keep partial DOS and displacements, as a job file does by default.</param>
    public static (PointResult Result, Timing.Result Time) Run(CaseFile cases, string section, bool finite, int warmups, int repeats, bool jobDefaults = false)
    {
        var s = cases.Section(section);
        var model = cases.Model(s.GetProperty("model").GetString()!);
        var counts = CaseFile.Ints(s.GetProperty(finite ? "cells" : "mesh"));
        Sample sample = finite ? FiniteSample.Create(counts[0], counts[1], counts[2]) : BulkSample.Create(counts[0], counts[1], counts[2]);
        var options = Options(cases, s.GetProperty("dos_bins").GetInt32());
        if (jobDefaults)
        {
            options = options with { PartialDos = true, MeanSquareDisplacement = true };
        }

        PointResult? result = null;
        var time = Timing.Measure(() => result = PhononSolver.Solve(model, sample, options), warmups, repeats);
        return (result!, time);
    }

    /// <summary>DOS and thermal functions only: no partial DOS, displacements, dispersion or mode list.</summary>
    public static SolveOptions Options(CaseFile cases, int dosBins) => new()
    {
        TemperaturesK = cases.Temperatures(),
        ReferenceTemperatureK = 300.0,
        DosBins = dosBins,
        PartialDos = false,
        MeanSquareDisplacement = false,
        ModeListMaxModes = 0,
    };

    public static Dictionary<string, object> Describe(PointResult r, Timing.Result t) => new()
    {
        ["median_s"] = t.MedianSeconds,
        ["min_s"] = t.MinSeconds,
        ["median_cpu_s"] = t.MedianCpuSeconds,
        ["runs"] = t.Samples.Length,
        ["warmups"] = t.Warmups,
        ["first_s"] = t.FirstSeconds,
        ["first_cpu_s"] = t.FirstCpuSeconds,
        ["warmup_cpu_s"] = t.WarmupCpuSeconds,
        ["methods_compiled_while_timed"] = t.MethodsCompiledWhileTimed,
        ["q_points_solved"] = r.Summary.QPointsSolved,
        ["modes"] = r.Summary.ModeCount,
        ["max_frequency_thz"] = r.Summary.MaxFrequencyThz,
        ["dos_frequency_thz"] = r.Dos.FrequencyThz.ToArray(),
        ["dos_total"] = r.Dos.Total.ToArray(),
        ["dos_method"] = r.Dos.Method,
        ["temperature_k"] = r.Thermal.Select(x => x.TemperatureK).ToArray(),
        ["internal_j_per_mol"] = r.Thermal.Select(x => x.InternalEnergyJPerMol).ToArray(),
        ["free_j_per_mol"] = r.Thermal.Select(x => x.FreeEnergyJPerMol).ToArray(),
        ["entropy_j_per_mol_k"] = r.Thermal.Select(x => x.EntropyJPerMolK).ToArray(),
        ["cv_j_per_mol_k"] = r.Thermal.Select(x => x.HeatCapacityJPerMolK).ToArray(),
        ["zero_point_j_per_mol"] = r.Summary.ZeroPointEnergyJPerMol ?? double.NaN,
    };

    /// <summary>The warm-up's share, printed beside the median: what a process's first solve costs and whether the JIT still ran while timed.</summary>
    public static string WarmupNote(Timing.Result t) => FormattableString.Invariant(
        $"{t.Warmups} warm-ups, {t.WarmupCpuSeconds:F2} s CPU; first solve {t.FirstSeconds:F3} s (cpu {t.FirstCpuSeconds:F3} s); {t.MethodsCompiledWhileTimed} methods compiled while timed");

    public static ImmutableArray<double> Column(PointResult r, Func<ThermalRow, double> pick) => [.. r.Thermal.Select(pick)];
}
