using System.Collections.Immutable;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>How the axes of a sweep are combined into points.</summary>
internal enum CombineMode
{
    Grid,
    Zip,
    LatinHypercube,
    Random,
}

/// <summary>The <c>[sweep]</c> section as written: header fields, axes and an optional candidates table.</summary>
internal sealed record SweepDeclaration(
    string Name,
    string Description,
    ulong Seed,
    long MaxPoints,
    CombineMode Combine,
    int? Count,
    ImmutableArray<AxisDeclaration> Axes,
    CandidatesDeclaration? Candidates,
    double WarnPointTimeS);

/// <summary>One <c>[[sweep.axes]]</c> entry; values are checked against the field once the path is resolved.</summary>
internal sealed record AxisDeclaration(string Path, TableReader Table, AxisSource Source);

/// <summary>Where an axis takes its values from.</summary>
internal abstract record AxisSource;

/// <summary><c>values = [...]</c>: raw TOML values (long, double, string or bool).</summary>
internal sealed record ValueListSource(ImmutableArray<object> Values) : AxisSource;

/// <summary><c>range = { from, to, steps, scale }</c>; <see cref="Steps"/> is null under sampling combines, where the range is an interval.</summary>
internal sealed record RangeSource(double From, double To, int? Steps, bool Log) : AxisSource;

/// <summary><c>random = { from, to, count, scale }</c>: <see cref="Count"/> values drawn uniformly (on the scale) with the sweep seed.</summary>
internal sealed record RandomSource(double From, double To, int Count, bool Log) : AxisSource;

/// <summary><c>[sweep.candidates]</c>: a CSV or Parquet file, its columns mapped to field paths, and text columns kept as they are.</summary>
internal sealed record CandidatesDeclaration(
    string FilePath,
    TableReader Table,
    ImmutableArray<KeyValuePair<string, string>> Columns,
    ImmutableArray<string> Keep);
