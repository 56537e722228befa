using System.Collections.Immutable;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// Where a swept column's values are written in the job file: the field path it sets (and the other
/// names of that field, such as <c>model.sites[1].mass_amu</c> for <c>model.sites.B.mass_amu</c>), its
/// column, and the line and column of the key that lists its values (an axis's <c>values</c>,
/// <c>range</c> or <c>random</c>; a candidates column's entry in <c>[sweep.candidates.columns]</c>).
/// A failed point names these, so a user goes from a failure to the line to edit; for a candidates column
/// (<paramref name="CandidateColumn"/>, its name in the candidates file) the failing candidate's row instead.
/// </summary>
internal sealed record SweptKey(string Path, string Column, ImmutableArray<string> OtherNames, string DeclaredAt, int Line, int LineColumn, string? CandidateColumn = null)
{
    /// <summary><c>FILE:LINE:COL</c> of the values in the job file (the file alone when the line is unknown).</summary>
    public string Location(string file) => Line > 0 ? $"{file}:{Line}:{LineColumn}" : file;

    /// <summary>True when <paramref name="key"/> (a job-file key path) names this field or a part of it, or the field is a part of it.</summary>
    public bool Touches(string key) => Related(Path, key) || OtherNames.Any(n => Related(n, key));

    private static bool Related(string a, string b) => Within(a, b) || Within(b, a);

    /// <summary>True when <paramref name="inner"/> equals <paramref name="outer"/> or lies below it (<c>outer.x</c>, <c>outer[0]</c>).</summary>
    private static bool Within(string inner, string outer) =>
        inner.StartsWith(outer, StringComparison.Ordinal)
        && (inner.Length == outer.Length || inner[outer.Length] is '.' or '[');
}
