using System.Collections.Immutable;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.QuasiHarmonic;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Planning.Specs;
using Tomlyn.Model;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>Reads <c>[output]</c>: temperatures, the DOS grid, the tables to write, an optional dispersion path, conductivity estimates and thermal expansion.</summary>
internal static class OutputSectionReader
{
    public const double MaxTemperatureK = 100_000;
    public const int MaxTemperatures = 10_000;

    private static readonly string[] Keys =
        ["temperatures_k", "temperature_range", "reference_temperature_k", "dos_bins", "dos_method", "gaussian_sigma_thz", "partial_dos", "thermal_mesh_check", "tables", "dispersion", "mode_list_max_modes", "memory_limit_gib", "conductivity", "expansion"];

    private static readonly string[] RangeKeys = ["from_k", "to_k", "steps", "scale"];
    private static readonly string[] DispersionKeys = ["path", "points_per_segment"];
    private static readonly string[] CornerKeys = ["label", "q"];
    private static readonly string[] TableNames = ["dos", "thermal", "modes", "dispersion", Output.TableNames.MeanSquareDisplacements, "cumulative_kappa", Output.TableNames.Layers, Output.TableNames.LayerDos, "expansion"];
    private static readonly string[] ExpansionKeys = ["volumes", "largest_strain", "mode_grueneisen"];

    // The table's former name, so older job files (and sweeps stored with them) still plan.
    private static readonly string[] FormerTableNames = [Output.TableNames.FormerDisplacements];

    public static (SolveOptions Options, OutputSelection Tables)? Read(TableReader? t, int dimension, ModelSpec? model = null, SampleSpec? sample = null, bool kindSwept = false)
    {
        var defaults = new SolveOptions();
        if (t is null)
        {
            return (defaults, OutputSelection.Default);
        }

        var before = t.Problems.Count;
        t.RejectUnknown(Keys);
        var temperatures = ReadTemperatures(t) ?? defaults.TemperaturesK;
        var reference = t.Double("reference_temperature_k", check: Checks.Between(0, MaxTemperatureK)) ?? defaults.ReferenceTemperatureK;
        var bins = (int)(t.Integer("dos_bins", 10, 100_000) ?? defaults.DosBins);
        var method = t.String("dos_method", allowed: ["auto", "gaussian"]) == "gaussian" ? DosMethod.Gaussian : DosMethod.Auto;
        var sigma = t.Double("gaussian_sigma_thz", check: Checks.Between(1e-6, 1e4)) ?? defaults.GaussianSigmaThz;
        if (t.Has("gaussian_sigma_thz") && method != DosMethod.Gaussian)
        {
            t.Error("gaussian_sigma_thz", "only used with dos_method = \"gaussian\"");
        }

        var partial = t.Bool("partial_dos") ?? defaults.PartialDos;
        var meshCheck = t.Bool("thermal_mesh_check") ?? defaults.MeshCheck;
        var modeMax = t.Integer("mode_list_max_modes", 0, 100_000_000) ?? defaults.ModeListMaxModes;
        var memoryGib = t.Double("memory_limit_gib", check: Checks.Between(0.01, 1024));
        var dispersion = ReadDispersion(t.SubTable("dispersion"), dimension);
        var conductivity = t.SubTable("conductivity") is { } c ? ConductivitySectionReader.Read(c, dimension, model, sample, kindSwept, expansionGiven: t.Has("expansion")) : null;
        var expansion = t.SubTable("expansion") is { } e ? ReadExpansion(e, model, dispersion is not null || t.Has("dispersion")) : null;
        if (conductivity is { Umklapp: not null, GrueneisenParameter: null } && expansion is not null && reference == 0)
        {
            // Without a given gamma the Umklapp rate takes the quasi-harmonic one at the reference temperature,
            // which no excited mode defines at 0 K: every point would fail when it runs, unseen by check.
            t.Error("reference_temperature_k",
                "0 K leaves the Umklapp channel without a Grueneisen parameter: output.conductivity.grueneisen_parameter is not given and the quasi-harmonic one is undefined at 0 K (no mode is excited); give grueneisen_parameter, or a reference temperature above 0");
        }

        // Samples with boundaries, a shape or disorder get their layer tables unless the list says otherwise.
        var realSpace = sample?.RealSpace is not null;
        var selection = OutputSelection.Default with { Dispersion = dispersion is not null, Layers = realSpace, LayerDos = realSpace, Expansion = expansion is not null };
        var tables = t.StringList("tables", TableNames, FormerTableNames);
        if (tables is not null)
        {
            selection = new OutputSelection(
                Dos: tables.Contains("dos"),
                Thermal: tables.Contains("thermal"),
                Dispersion: tables.Contains("dispersion"),
                Modes: tables.Contains("modes"),
                Displacements: tables.Contains(Output.TableNames.MeanSquareDisplacements) || tables.Contains(Output.TableNames.FormerDisplacements),
                CumulativeKappa: tables.Contains("cumulative_kappa"),
                Layers: tables.Contains(Output.TableNames.Layers),
                LayerDos: tables.Contains(Output.TableNames.LayerDos),
                Expansion: tables.Contains("expansion"));
            if (selection.Dispersion && dispersion is null && !t.Has("dispersion"))
            {
                t.Error("tables", "the dispersion table needs a path: add [output.dispersion] with path = [{ label = \"G\", q = [0, 0, 0] }, ...]");
            }

            if (!selection.Dispersion && dispersion is not null)
            {
                t.Error("dispersion", "a dispersion path is given but \"dispersion\" is not in output.tables; add it there or remove the path");
            }

            if (selection.Expansion && !t.Has("expansion"))
            {
                t.Error("tables", "the expansion table needs the quasi-harmonic calculation: add [output.expansion] (and [[model.potentials]])");
            }

            if (selection.CumulativeKappa && !t.Has("conductivity"))
            {
                t.Error("tables", "the cumulative_kappa table needs conductivity estimates: add [output.conductivity] with at least one scattering channel");
            }
        }

        if (t.Problems.Count > before)
        {
            return null;
        }

        var options = defaults with
        {
            TemperaturesK = temperatures,
            ReferenceTemperatureK = reference,
            DosBins = bins,
            DosMethod = method,
            GaussianSigmaThz = sigma,
            PartialDos = partial,
            MeshCheck = meshCheck,
            ModeListMaxModes = modeMax,
            Dispersion = dispersion,
            MemoryLimitBytes = memoryGib is { } g ? (long)(g * (1L << 30)) : defaults.MemoryLimitBytes,
            Conductivity = conductivity is null ? null : conductivity with { MeanFreePathTable = selection.CumulativeKappa },
            Expansion = expansion,
        };
        return (options, selection);
    }

    private static ExpansionOptions? ReadExpansion(TableReader t, ModelSpec? model, bool hasPath)
    {
        var before = t.Problems.Count;
        t.RejectUnknown(ExpansionKeys);
        var defaults = new ExpansionOptions();
        var volumes = t.Integer("volumes", ExpansionOptions.MinVolumes, ExpansionOptions.MaxVolumes) ?? defaults.VolumeCount;
        var strain = t.Double("largest_strain", check: Checks.Between(0.002, 0.3)) ?? defaults.LargestLinearStrain;
        var modes = t.Bool("mode_grueneisen") ?? false;
        if (model is not null && model is not LatticeModelSpec { Potentials.IsEmpty: false })
        {
            t.TableError("thermal expansion needs springs that change with volume: give the model [[model.potentials]] (hand-set springs, bends and the builders keep their constants when the lattice expands)");
        }

        if (modes && !hasPath)
        {
            t.Error("mode_grueneisen", "mode Grueneisen parameters are reported along the dispersion path: add [output.dispersion] with a path");
        }

        return t.Problems.Count > before ? null : new ExpansionOptions { VolumeCount = (int)volumes, LargestLinearStrain = strain, ModeGrueneisen = modes };
    }

    private static ImmutableArray<double>? ReadTemperatures(TableReader t)
    {
        if (t.Has("temperatures_k") && t.Has("temperature_range"))
        {
            t.Error("temperature_range", "give either temperatures_k or temperature_range, not both");
            return null;
        }

        if (t.Has("temperatures_k"))
        {
            var list = t.DoubleList("temperatures_k", check: Checks.Between(0, MaxTemperatureK), maxCount: MaxTemperatures);
            return list is null ? null : [.. list.Distinct().Order()];
        }

        var range = t.SubTable("temperature_range");
        if (range is null)
        {
            return null;
        }

        range.RejectUnknown(RangeKeys);
        var from = range.Double("from_k", required: true, check: Checks.Between(0, MaxTemperatureK));
        var to = range.Double("to_k", required: true, check: Checks.Between(0, MaxTemperatureK));
        var steps = range.Integer("steps", 1, MaxTemperatures, required: true);
        var scale = range.String("scale", allowed: ["linear", "log"]) ?? "linear";
        if (from is null || to is null || steps is null)
        {
            return null;
        }

        if (to < from)
        {
            range.Error("to_k", $"must be >= from_k ({TableReader.Show(from.Value)})");
            return null;
        }

        if (scale == "log" && from <= 0)
        {
            range.Error("from_k", "a log scale needs from_k > 0");
            return null;
        }

        return [.. Spacing.Points(from.Value, to.Value, (int)steps.Value, scale == "log").Distinct()];
    }

    private static DispersionPath? ReadDispersion(TableReader? t, int dimension)
    {
        if (t is null)
        {
            return null;
        }

        t.RejectUnknown(DispersionKeys);
        var perSegment = (int)(t.Integer("points_per_segment", 2, 10_000) ?? 50);
        var corners = new List<PathCorner>();
        var tables = t.TableList("path", required: true);
        foreach (var c in tables)
        {
            c.RejectUnknown(CornerKeys);
            var label = c.String("label", required: true) ?? "";
            var q = c.DoubleList("q", required: true, check: Checks.ReducedWaveVector, maxCount: 3);
            if (q is not null && dimension > 0 && q.Count != dimension)
            {
                c.Error("q", $"a {dimension}D lattice takes {dimension} reduced coordinate(s) (units of the reciprocal vectors), got {q.Count}");
            }

            var v = q ?? [];
            corners.Add(new PathCorner(label, new Vec3(v.Count > 0 ? v[0] : 0, v.Count > 1 ? v[1] : 0, v.Count > 2 ? v[2] : 0)));
        }

        if (t.Has("path") && tables.Count < 2 && t.Raw("path") is TomlArray or TomlTableArray)
        {
            t.Error("path", "a dispersion path needs at least two corners");
        }

        return corners.Count >= 2 ? new DispersionPath([.. corners], perSegment) : null;
    }
}
