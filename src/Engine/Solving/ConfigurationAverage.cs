using System.Collections.Immutable;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Thermal;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// The configurational average of a disordered sample's points (all assembled on one frequency
/// grid): every number is the mean over the configurations, and its standard error the sample
/// standard deviation over them divided by sqrt(configurations). A band gap is kept where every
/// configuration has it (the intersection). The Debye temperature follows from the mean Cv.
/// </summary>
internal static class ConfigurationAverage
{
    public static PointResult Of(IReadOnlyList<PointResult> results, int dimension)
    {
        ArgumentOutOfRangeException.ThrowIfZero(results.Count);

        // One unstable configuration makes the disordered sample unstable: it is reported as it is.
        if (results.FirstOrDefault(r => !r.Summary.Stable) is { } unstable)
        {
            return unstable;
        }

        var first = results[0];
        var n = results.Count;
        double Mean(Func<PointResult, double> get) => results.Average(get);
        double? MeanN(Func<PointResult, double?> get) => results.All(r => get(r) is not null) ? results.Average(r => get(r)!.Value) : null;
        double ErrorN(Func<PointResult, double?> get) => results.All(r => get(r) is not null) ? KpmErrors.StandardError([.. results.Select(r => get(r)!.Value)]) : double.NaN;
        double? MeanOf(Func<PointResult, double?> get) => results.All(r => get(r) is not null) ? results.Average(r => get(r)!.Value) : null;
        double Error(Func<PointResult, double> get) => KpmErrors.StandardError([.. results.Select(get)]);
        double? ErrorOf(Func<PointResult, double?> get) => results.All(r => get(r) is not null) ? Finite(KpmErrors.StandardError([.. results.Select(r => get(r)!.Value)])) : null;

        var s = first.Summary;
        var classicalCvPerMol = results.Average(r => r.Summary.ClassicalHeatCapacityJPerMolK);
        const bool stable = true;
        var thermal = ImmutableArray.CreateBuilder<ThermalRow>(first.Thermal.Length);
        var thermalErrors = ImmutableArray.CreateBuilder<ThermalRow>(first.Thermal.Length);
        for (var t = 0; t < first.Thermal.Length; t++)
        {
            var k = t;
            var cv = Mean(r => r.Thermal[k].HeatCapacityJPerMolK);
            var temperature = first.Thermal[t].TemperatureK;
            thermal.Add(new ThermalRow(
                temperature,
                Mean(r => r.Thermal[k].InternalEnergyJPerMol),
                Mean(r => r.Thermal[k].FreeEnergyJPerMol),
                Mean(r => r.Thermal[k].EntropyJPerMolK),
                cv,
                Defined(DebyeModel.TemperatureFromHeatCapacity(temperature, cv / classicalCvPerMol, dimension))));
            thermalErrors.Add(new ThermalRow(
                temperature,
                Error(r => r.Thermal[k].InternalEnergyJPerMol),
                Error(r => r.Thermal[k].FreeEnergyJPerMol),
                Error(r => r.Thermal[k].EntropyJPerMolK),
                Error(r => r.Thermal[k].HeatCapacityJPerMolK),
                Defined(ErrorN(r => r.Thermal[k].DebyeTemperatureK))));
        }

        var summary = s with
        {
            ModeCount = s.ModeCount,
            QPointsSolved = results.Sum(r => r.Summary.QPointsSolved),
            ZeroModesExcluded = results.Max(r => r.Summary.ZeroModesExcluded),
            MaxFrequencyThz = Mean(r => r.Summary.MaxFrequencyThz),
            MinFrequencyThz = results.Min(r => r.Summary.MinFrequencyThz),
            Stable = stable,
            WorstQReduced = null,
            Gaps = CommonGaps(results),
            HeatCapacityJPerMolK = MeanN(r => r.Summary.HeatCapacityJPerMolK),
            EntropyJPerMolK = MeanN(r => r.Summary.EntropyJPerMolK),
            FreeEnergyJPerMol = MeanN(r => r.Summary.FreeEnergyJPerMol),
            InternalEnergyJPerMol = MeanN(r => r.Summary.InternalEnergyJPerMol),
            ZeroPointEnergyJPerMol = MeanN(r => r.Summary.ZeroPointEnergyJPerMol),
            DebyeTemperatureFromCvK = MeanN(r => r.Summary.HeatCapacityJPerMolK) is { } cvReference
                ? Defined(DebyeModel.TemperatureFromHeatCapacity(s.ReferenceTemperatureK, cvReference / classicalCvPerMol, dimension))
                : null,
            DebyeTemperatureMomentMinus2K = MeanN(r => r.Summary.DebyeTemperatureMomentMinus2K),
            DebyeTemperatureMomentLogK = MeanN(r => r.Summary.DebyeTemperatureMomentLogK),
            DebyeTemperatureMoment2K = MeanN(r => r.Summary.DebyeTemperatureMoment2K),
            MolarMassKgPerMol = Mean(r => r.Summary.MolarMassKgPerMol),
            ClassicalHeatCapacityJPerMolK = classicalCvPerMol,
        };

        var dos = first.Dos with
        {
            Total = MeanCurve(results.Select(r => r.Dos.Total)),
            PartialBySite = [.. Enumerable.Range(0, first.Dos.PartialBySite.Length).Select(site => MeanCurve(results.Select(r => r.Dos.PartialBySite[site])))],
        };
        var dosErrors = ImmutableArray.CreateBuilder<double>(first.Dos.Total.Length);
        for (var b = 0; b < first.Dos.Total.Length; b++)
        {
            var k = b;
            dosErrors.Add(Error(r => r.Dos.Total[k]));
        }

        var displacements = first.Displacements.Select((d, i) => d with
        {
            MsdXNm2 = MeanN(r => r.Displacements[i].MsdXNm2),
            MsdYNm2 = MeanN(r => r.Displacements[i].MsdYNm2),
            MsdZNm2 = MeanN(r => r.Displacements[i].MsdZNm2),
        }).ToImmutableArray();

        var f = first.Surface!;
        double? Ratio(PointResult r) => r.Surface?.PeriodicCvAtReferenceJPerMolK is { } p && p > 0 ? r.Summary.HeatCapacityJPerMolK / p : null;
        static double? Defined(double x) => double.IsNaN(x) ? null : x;
        var surface = f with
        {
            RotationDefectThz = MeanOf(r => r.Surface!.RotationDefectThz),
            ConfinementGapThz = MeanOf(r => r.Surface!.ConfinementGapThz),
            SurfaceModeFraction = MeanOf(r => r.Surface!.SurfaceModeFraction),
            MsdSurfaceNm2 = MeanOf(r => r.Surface!.MsdSurfaceNm2),
            MsdInteriorNm2 = MeanOf(r => r.Surface!.MsdInteriorNm2),
            Layers = [.. f.Layers.Select((l, i) => l with
            {
                MsdXNm2 = MeanOf(r => r.Surface!.Layers[i].MsdXNm2),
                MsdYNm2 = MeanOf(r => r.Surface!.Layers[i].MsdYNm2),
                MsdZNm2 = MeanOf(r => r.Surface!.Layers[i].MsdZNm2),
                MsdXStderrNm2 = ErrorOf(r => r.Surface!.Layers[i].MsdXNm2),
                MsdYStderrNm2 = ErrorOf(r => r.Surface!.Layers[i].MsdYNm2),
                MsdZStderrNm2 = ErrorOf(r => r.Surface!.Layers[i].MsdZNm2),
            })],
            LayerDos = [.. f.LayerDos.Select((l, i) => l with
            {
                DensityPerThzPerAtom = MeanCurve(results.Select(r => r.Surface!.LayerDos[i].DensityPerThzPerAtom)),
                StandardErrorPerThzPerAtom = ErrorCurve(results.Select(r => r.Surface!.LayerDos[i].DensityPerThzPerAtom)),
            })],
        };

        var errors = new StatisticalErrors
        {
            Source = "configurations",
            Samples = n,
            Thermal = thermalErrors.MoveToImmutable(),
            HeatCapacityJPerMolK = Finite(ErrorN(r => r.Summary.HeatCapacityJPerMolK)),
            EntropyJPerMolK = Finite(ErrorN(r => r.Summary.EntropyJPerMolK)),
            FreeEnergyJPerMol = Finite(ErrorN(r => r.Summary.FreeEnergyJPerMol)),
            InternalEnergyJPerMol = Finite(ErrorN(r => r.Summary.InternalEnergyJPerMol)),
            ZeroPointEnergyJPerMol = Finite(ErrorN(r => r.Summary.ZeroPointEnergyJPerMol)),
            MaxFrequencyThz = Finite(Error(r => r.Summary.MaxFrequencyThz)),
            ConfinementGapThz = ErrorOf(r => r.Surface!.ConfinementGapThz),
            SurfaceModeFraction = ErrorOf(r => r.Surface!.SurfaceModeFraction),
            MsdSurfaceNm2 = ErrorOf(r => r.Surface!.MsdSurfaceNm2),
            MsdInteriorNm2 = ErrorOf(r => r.Surface!.MsdInteriorNm2),
            CvRatioToPeriodic = ErrorOf(Ratio),
            DosTotal = dosErrors.MoveToImmutable(),
        };

        return first with
        {
            Summary = summary,
            Dos = dos,
            Thermal = thermal.MoveToImmutable(),
            Displacements = displacements,
            // Each configuration is a crystal of its own with exact modes; they are listed side by side, not averaged.
            Modes = [.. results.SelectMany((r, k) => r.Modes.Select(m => m with { Configuration = k }))],
            Surface = surface,
            Errors = errors,
        };
    }

    private static double? Finite(double x) => double.IsFinite(x) ? x : null;

    /// <summary>Standard error of each bin over the configurations (empty with one).</summary>
    private static ImmutableArray<double> ErrorCurve(IEnumerable<ImmutableArray<double>> curves)
    {
        var list = curves.ToList();
        if (list.Count < 2)
        {
            return [];
        }

        var errors = new double[list[0].Length];
        var values = new double[list.Count];
        for (var b = 0; b < errors.Length; b++)
        {
            for (var k = 0; k < list.Count; k++)
            {
                values[k] = b < list[k].Length ? list[k][b] : 0;
            }

            errors[b] = KpmErrors.StandardError(values);
        }

        return [.. errors];
    }

    private static ImmutableArray<double> MeanCurve(IEnumerable<ImmutableArray<double>> curves)
    {
        var list = curves.ToList();
        var mean = new double[list[0].Length];
        foreach (var c in list)
        {
            for (var i = 0; i < mean.Length && i < c.Length; i++)
            {
                mean[i] += c[i] / list.Count;
            }
        }

        return [.. mean];
    }

    /// <summary>Frequency stretches that are a gap in every configuration.</summary>
    private static ImmutableArray<BandGap> CommonGaps(IReadOnlyList<PointResult> results)
    {
        var gaps = results[0].Summary.Gaps.Select(g => (g.LowerThz, g.UpperThz)).ToList();
        foreach (var r in results.Skip(1))
        {
            var next = new List<(double, double)>();
            foreach (var (lo, hi) in gaps)
            {
                foreach (var g in r.Summary.Gaps)
                {
                    var a = Math.Max(lo, g.LowerThz);
                    var b = Math.Min(hi, g.UpperThz);
                    if (b > a)
                    {
                        next.Add((a, b));
                    }
                }
            }

            gaps = next;
        }

        return [.. gaps.Select(g => new BandGap(g.Item1, g.Item2))];
    }
}
