using System.Collections.Immutable;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// A validated, fully expanded sweep: everything the queue, the writers and the catalog need.
/// <see cref="SpecText"/> is the job file exactly as given (it goes into the manifest);
/// <see cref="Template"/> is the parsed job model that <see cref="PointBinder"/> applies each
/// point's parameters to.
/// </summary>
public sealed record SweepPlan
{
    public required string SweepName { get; init; }
    public string Description { get; init; } = "";
    public required string SourcePath { get; init; }
    public required string SpecText { get; init; }
    public required ImmutableArray<AxisInfo> Axes { get; init; }
    public required PlanPoints Points { get; init; }
    public required OutputSelection Outputs { get; init; }
    public required JobTemplate Template { get; init; }

    /// <summary>A hash of the canonical spec: a sweep re-submitted unchanged has the same id.</summary>
    public required string SpecHash { get; init; }

    /// <summary>
    /// A hash of the sweep's definition (the spec hash's head, every column and its values, the
    /// number of points) when every point of the expansion was kept, else null: stored at submit, it
    /// lets a worker plan the sweep without computing every point's id (see <c>JobFilePlanSource</c>).
    /// </summary>
    public string? DefinitionHash { get; init; }

    /// <summary>Points that came out of the expansion twice with the same parameters and were kept once.</summary>
    public int DuplicatePointsCollapsed { get; init; }

    /// <summary>"grid", "zip", "latin_hypercube" or "random": how the axes were combined.</summary>
    public string Combine { get; init; } = "grid";

    /// <summary>
    /// <c>[sweep] warn_point_time_s</c>: <c>check</c> warns about points estimated to take longer on
    /// one core. A setting for people, not for the results: not part of <see cref="SpecHash"/>.
    /// </summary>
    public double WarnPointTimeS { get; init; } = JobFiles.SweepSectionReader.DefaultWarnPointTimeS;

    /// <summary>Where each swept column's values are written in the job file (for failures: <c>FailureLocator</c>).</summary>
    internal ImmutableArray<SweptKey> SweptKeys { get; init; } = [];

    /// <summary>The candidates file the sweep read, if any (its content is part of <see cref="SpecHash"/>).</summary>
    public string? CandidatesFile { get; init; }

    /// <summary>Each candidate's row in <see cref="CandidatesFile"/>, for a failure traced to a candidates column.</summary>
    internal CandidateRows? CandidateRows { get; init; }

    /// <summary>
    /// The candidates row point <paramref name="point"/> comes from (<c>FILE:LINE</c> of a CSV file, <c>FILE row N</c> of
    /// a Parquet file), or null without a candidates table or for a point that is not this plan's own at its index.
    /// </summary>
    internal string? CandidateRowOf(PlannedPoint point)
    {
        if (CandidateRows is not { } rows || point.Index < 0 || point.Index >= Points.Count
            || !string.Equals(Points.IdAt(point.Index), point.PointId, StringComparison.Ordinal))
        {
            return null;
        }

        var row = Points.ExpansionPositionOf(point.Index) / Math.Max(1, rows.PointsPerRow);
        return row < rows.RowLines.Length ? rows.Place(rows.RowLines[(int)row]) : null;
    }
}

/// <summary>
/// A candidates file's rows: the file, each row's line (CSV) or row number (Parquet), and the points each row
/// gives (candidates are outermost in the expansion, so position / <paramref name="PointsPerRow"/> is the row).
/// </summary>
internal sealed record CandidateRows(string File, bool IsCsv, ImmutableArray<int> RowLines, long PointsPerRow)
{
    public string Place(int line) => IsCsv
        ? $"{File}:{line.ToString(System.Globalization.CultureInfo.InvariantCulture)}"
        : $"{File} row {line.ToString(System.Globalization.CultureInfo.InvariantCulture)}";
}
