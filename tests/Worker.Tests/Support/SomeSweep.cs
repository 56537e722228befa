using System.Collections.Immutable;
using LatticeSweep.Engine.Results;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>Invented test data (demo values, not physics): plans, points and results built by hand.</summary>
internal static class SomeSweep
{
    public const string MassColumn = "mass_amu";
    public const string CellsColumn = "cells";

    public static AxisInfo MassAxis(params double[] values) =>
        new("model.sites.A.mass_amu", MassColumn, "amu", AxisValueType.Double, [.. values.Select(v => (object)v)]);

    public static AxisInfo CellsAxis(params long[] values) =>
        new("sample.cells", CellsColumn, "", AxisValueType.Integer, [.. values.Select(v => (object)v)]);

    /// <summary>A full grid of masses x cells, point ids made from the parameters.</summary>
    public static SweepPlan Plan(string name = "demo grid", double[]? masses = null, long[]? cells = null, OutputSelection? outputs = null, string? sourcePath = null)
    {
        masses ??= [10.0, 20.0, 30.0];
        cells ??= [4, 8];
        var points = new List<PlannedPoint>();
        foreach (var m in masses)
        {
            foreach (var n in cells)
            {
                var parameters = ImmutableSortedDictionary.CreateRange(StringComparer.Ordinal,
                    [new KeyValuePair<string, object>(MassColumn, m), new KeyValuePair<string, object>(CellsColumn, n)]);
                points.Add(new PlannedPoint($"p{points.Count:D3}-m{m}-n{n}", points.Count, parameters));
            }
        }

        return new SweepPlan
        {
            SweepName = name,
            Description = "invented demo sweep",
            SourcePath = sourcePath ?? "/tmp/none.toml",
            SpecText = "# invented\n[sweep]\nname = \"" + name + "\"\n",
            Axes = [MassAxis(masses), CellsAxis(cells)],
            Points = [.. points],
            Outputs = outputs ?? OutputSelection.Default,
            Template = Template.Value,
            SpecHash = "0123abcd" + string.Concat(name.Select(c => ((int)c).ToString("x2", System.Globalization.CultureInfo.InvariantCulture))),
        };
    }

    /// <summary>
    /// <paramref name="count"/> points whose mass is a drawn axis on [10, 60] (as a Latin hypercube's would be; here spread
    /// evenly, both ends and some bin edges among them) and whose cells alternate between 4 and 8 (a listed axis).
    /// </summary>
    public static SweepPlan DrawnPlan(string name, int count)
    {
        var points = new List<PlannedPoint>();
        for (var i = 0; i < count; i++)
        {
            var m = i == count - 1 ? 60.0 : Math.Round(10 + (50.0 * i / (count - 1)), 9);
            long n = i % 2 == 0 ? 4 : 8;
            var parameters = ImmutableSortedDictionary.CreateRange(StringComparer.Ordinal,
                [new KeyValuePair<string, object>(MassColumn, m), new KeyValuePair<string, object>(CellsColumn, n)]);
            points.Add(new PlannedPoint($"d{i:D4}-m{m}-n{n}", i, parameters));
        }

        var plan = Plan(name);
        return plan with
        {
            Axes = [MassAxis() with { Drawn = new DrawnRange(10, 60, false, count, AxisBins.BinsFor(count)) }, CellsAxis(4, 8)],
            Points = [.. points],
        };
    }

    /// <summary>A real template (from a tiny chain job file); these plans only go to a fake solver.</summary>
    private static readonly Lazy<JobTemplate> Template = new(() =>
    {
        using var dir = new TempDirectory();
        return Some.Load(dir, Some.ChainJob()).Template;
    });

    /// <summary>A made-up result whose numbers depend on the point's mass, so rows can be told apart.</summary>
    public static PointResult Result(PlannedPoint point)
    {
        var mass = point.Parameters.TryGetValue(MassColumn, out var m) ? (double)m : 1.0;
        var scale = 10.0 / Math.Sqrt(mass);
        var freqs = Enumerable.Range(0, 5).Select(i => scale * (i + 0.5) / 5).ToImmutableArray();
        var summary = new PointSummary
        {
            Dimension = 1,
            SitesPerCell = 2,
            BranchCount = 2,
            SampleKind = "finite",
            CellsOrMeshPoints = point.Parameters.TryGetValue(CellsColumn, out var n) ? (long)n : 1,
            QPointsSolved = 3,
            ModeCount = 8,
            RigidModesExcluded = 1,
            MaxFrequencyThz = scale,
            MinFrequencyThz = 0,
            Stable = true,
            WorstQReduced = null,
            Gaps = [new BandGap(0.4 * scale, 0.6 * scale), new BandGap(0.8 * scale, 0.85 * scale)],
            SoundSpeeds = [new SoundSpeed("x", [1000 * scale])],
            ReferenceTemperatureK = 300,
            HeatCapacityJPerMolK = 20 + mass / 100,
            EntropyJPerMolK = 30,
            FreeEnergyJPerMol = -1000,
            InternalEnergyJPerMol = 5000,
            ZeroPointEnergyJPerMol = 800,
            DebyeTemperatureFromCvK = 250,
            DebyeTemperatureMomentMinus2K = 240,
            DebyeTemperatureMomentLogK = 245,
            DebyeTemperatureMoment2K = 260,
            MolarMassKgPerMol = mass / 1000,
        };
        var dos = new DosCurve(freqs, [.. freqs.Select(f => f / scale)], [[.. freqs.Select(f => f / scale / 2)], [.. freqs.Select(f => f / scale / 2)]], "histogram");
        return new PointResult(
            summary,
            dos,
            [new ThermalRow(100, 1000 + mass, -50, 10, 15, 200), new ThermalRow(300, 3000 + mass, -900, 30, 20 + mass / 100, null)],
            [new DisplacementRow(300, 0, "A", 1e-4, 1e-4, 1e-4)],
            [],
            [new ModeLevel(0.0, 1), new ModeLevel(scale, 2)]);
    }
}
