using System.Collections.Immutable;
using LatticeSweep.Engine.Units;
using LatticeSweep.Worker.Catalog;
using LatticeSweep.Worker.Output;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>One summary number of a point: label, value, unit, the dataset's column name, and other units where readers want them.</summary>
public sealed record PointNumber(string Column, string Label, object? Value, string Unit, string? AlsoAs);

/// <summary>A titled group of a point's summary numbers.</summary>
public sealed record PointNumberGroup(string Title, ImmutableArray<PointNumber> Numbers);

/// <summary>A point's row of <c>points/</c>, grouped for reading.</summary>
public static class PointDetails
{
    private static readonly (string Title, Func<string, bool> Takes)[] Groups =
    [
        ("Spectrum", c => c.Contains("freq", StringComparison.Ordinal) || c.Contains("gap", StringComparison.Ordinal) || c.StartsWith("worst_q", StringComparison.Ordinal) || c == "stable"),
        ("Sound", c => c.StartsWith("sound_", StringComparison.Ordinal)),
        ("Mesh check (this mesh minus the half-density mesh)", c => c.Contains("_mesh_change", StringComparison.Ordinal) && !c.StartsWith("kappa_", StringComparison.Ordinal) || c == "thermal_check_mesh"),
        ("Thermal at the reference temperature", c => c is "reference_temperature_k" || c.StartsWith("cv_", StringComparison.Ordinal) || c.StartsWith("entropy_", StringComparison.Ordinal)
            || c.StartsWith("free_energy", StringComparison.Ordinal) || c.StartsWith("internal_energy", StringComparison.Ordinal) || c.StartsWith("zero_point", StringComparison.Ordinal)),
        ("Debye temperatures", c => c.StartsWith("debye_", StringComparison.Ordinal)),
        ("Thermal conductivity", c => c.StartsWith("kappa_", StringComparison.Ordinal) || c == "acoustic_debye_temperature_k"),
        ("Model and sample", c => c is "dimension" or "sites_per_cell" or "branch_count" or "sample_kind" or "cells_or_mesh_points" or "q_points_solved" or "mode_count" or "rigid_modes_excluded" or "molar_mass_kg_per_mol" or "dos_method"),
        ("Run", c => c is "point_index" or "chunk_id" or "state" or "failure_kind" or "error" or "attempt" or "started_at" or "finished_at" or "duration_s" or "engine_version"),
    ];

    /// <summary>Groups the point's row (one row of <paramref name="row"/>) by topic.</summary>
    internal static ImmutableArray<PointNumberGroup> Build(SweepRecord sweep, ResultTable row)
    {
        ArgumentNullException.ThrowIfNull(row);
        if (row.Rows.Length == 0)
        {
            return [];
        }

        var names = new ColumnCatalog(sweep, TableNames.Points);
        var values = row.Rows[0];
        var numbers = row.Columns.Select((c, i) => Number(c, names, values[i])).Where(n => n.Column != "point_id").ToList();
        // The swept parameters are shown apart (with the catalog's values), so they are left out here.
        var result = new List<PointNumberGroup>();
        var taken = new HashSet<string>(names.Parameters, StringComparer.Ordinal) { "point_id" };
        foreach (var (title, takes) in Groups)
        {
            var group = numbers.Where(n => !taken.Contains(n.Column) && takes(n.Column)).ToList();
            taken.UnionWith(group.Select(n => n.Column));
            result.Add(new PointNumberGroup(title, [.. group]));
        }

        result.Add(new PointNumberGroup("Other", [.. numbers.Where(n => !taken.Contains(n.Column))]));
        // A group with no number at all (e.g. conductivity for a point that asked for none) is left out.
        return [.. result.Where(g => g.Numbers.Any(n => n.Value is not null))];
    }

    private static PointNumber Number(ResultColumn column, ColumnCatalog names, object? value)
    {
        var unit = names.Unit(column);
        string? also = null;
        if (unit == "THz" && ResultTable.ToDouble(value) is { } thz)
        {
            also = $"{Formatting.Show.Number(FrequencyUnits.MevFromThz(thz), "meV")}, {Formatting.Show.Number(FrequencyUnits.InverseCmFromThz(thz), "cm⁻¹")}";
        }

        return new PointNumber(column.Name, names.Label(column.Name), value, unit, also);
    }
}
