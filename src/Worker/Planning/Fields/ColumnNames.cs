using System.Text;

namespace LatticeSweep.Worker.Planning.Fields;

/// <summary>Parquet column names and units derived from job-file paths and keys.</summary>
internal static class ColumnNames
{
    /// <summary>
    /// snake_case from a path, the <c>model.</c> and <c>output.</c> prefixes dropped and units kept:
    /// <c>model.sites.Ga.mass_amu</c> becomes <c>sites_ga_mass_amu</c>, <c>model.springs[0].longitudinal_n_per_m</c>
    /// becomes <c>springs_0_longitudinal_n_per_m</c>, <c>sample.cells</c> stays <c>sample_cells</c>,
    /// <c>output.conductivity.boundary.length_nm</c> becomes <c>conductivity_boundary_length_nm</c>.
    /// </summary>
    public static string FromPath(string path)
    {
        var p = path.StartsWith("model.", StringComparison.Ordinal) ? path["model.".Length..]
            : path.StartsWith("output.", StringComparison.Ordinal) ? path["output.".Length..]
            : path;
        return Snake(p);
    }

    public static string Snake(string text)
    {
        var sb = new StringBuilder(text.Length);
        foreach (var ch in text)
        {
            if (char.IsAsciiLetterOrDigit(ch))
            {
                sb.Append(char.ToLowerInvariant(ch));
            }
            else if (sb.Length > 0 && sb[^1] != '_')
            {
                sb.Append('_');
            }
        }

        var s = sb.ToString().TrimEnd('_');
        return s.Length == 0 ? "column" : char.IsAsciiDigit(s[0]) ? "c_" + s : s;
    }

    /// <summary>The unit a key's suffix names (<c>_amu</c>, <c>_nm</c>, <c>_n_per_m</c>, ...); "1" for counts and fractions.</summary>
    public static string UnitOf(string key) => key switch
    {
        _ when key.EndsWith("_n_per_m", StringComparison.Ordinal) => "N/m",
        _ when key.EndsWith("_per_nm", StringComparison.Ordinal) => "1/nm",
        _ when key.EndsWith("_ev_nm6", StringComparison.Ordinal) => "eV nm^6",
        _ when key.EndsWith("_ev", StringComparison.Ordinal) => "eV",
        _ when key.EndsWith("_amu", StringComparison.Ordinal) => "amu",
        _ when key.EndsWith("_nm", StringComparison.Ordinal) => "nm",
        _ when key.EndsWith("_gpa", StringComparison.Ordinal) => "GPa",
        _ when key.EndsWith("_k", StringComparison.Ordinal) => "K",
        _ when key.EndsWith("_thz", StringComparison.Ordinal) => "THz",
        _ when key.EndsWith("_nm2", StringComparison.Ordinal) => "nm^2",
        _ when key.EndsWith("_ps", StringComparison.Ordinal) => "ps",
        _ when key.EndsWith("_m_per_s", StringComparison.Ordinal) => "m/s",
        "element" or "kind" => "",
        _ => "1",
    };
}
