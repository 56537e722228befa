using System.Collections.Immutable;
using System.Text.Json.Serialization;

namespace LatticeSweep.Dashboard.Datasets;

/// <summary>How an axis is scaled: chosen by the data (logarithmic when its values span decades), or fixed.</summary>
public enum AxisScale
{
    Auto,
    Linear,
    Log,
}

/// <summary>A plot axis: its column, label and unit; logarithmic or not; for a text column, its categories (x only).</summary>
public sealed record PlotAxis(string Column, string Label, string Unit, bool Log, bool Categorical, ImmutableArray<string> Categories);

/// <summary>
/// One plotted point. For a categorical x axis <see cref="X"/> is the category's index. Its page is
/// <see cref="SweepPlot.PointUrl"/> followed by the escaped <see cref="PointId"/> (not repeated per
/// point: a plot of 10^5 points would carry megabytes of addresses). The marks are written only when true.
/// </summary>
public sealed record PlotPoint(
    double X,
    double Y,
    string PointId,
    [property: JsonIgnore(Condition = JsonIgnoreCondition.WhenWritingDefault)] bool Unstable,
    [property: JsonIgnore(Condition = JsonIgnoreCondition.WhenWritingDefault)] bool Floppy);

/// <summary>One series: drawn as a line through its points when <see cref="Lines"/>, else as points only.</summary>
public sealed record PlotSeries(string Name, bool Lines, ImmutableArray<PlotPoint> Points);

/// <summary>
/// A plot of a sweep's points/ table: a summary column against a swept parameter, one series per
/// value of another parameter (<c>parameter</c>), or two columns against each other with their
/// Pareto front (<c>scatter</c>). <see cref="Notes"/> say what the reader should know (points
/// left out, a log scale that could not be used, several points per x). <see cref="PointUrl"/> and a
/// point's escaped id make the address of the point's page.
/// </summary>
public sealed record SweepPlot(
    string Kind,
    string PointUrl,
    PlotAxis X,
    PlotAxis Y,
    string? GroupBy,
    string? GroupLabel,
    ImmutableArray<PlotSeries> Series,
    ImmutableArray<PlotPoint> Front,
    string? FrontRule,
    int Plotted,
    int LeftOut,
    ImmutableArray<string> Notes)
{
    /// <summary>
    /// A plot draws at most about this many points: past it, each series keeps an even sample in
    /// its own order (its first and last point always), so a sweep of a million points sends
    /// kilobytes, not megabytes, and the browser stays responsive. The Pareto front is found over
    /// every point and drawn whole; the table and the downloads have every point.
    /// </summary>
    public const int MaxDrawn = Worker.Output.FirstLoadFacts.MaxDrawn;

    /// <summary>
    /// The front's rows (positions in the view the plot was made from, in <see cref="Front"/>'s order) when the plot was
    /// worked out from the rows; default when it came from the merge's entry. Not sent: the page finds the front's listed
    /// parameters by them instead of a pass over every point id (<c>FrontParameters</c>).
    /// </summary>
    [JsonIgnore]
    internal ImmutableArray<int> FrontRows { get; init; }

    /// <summary>The points sent to be drawn (at most about <see cref="MaxDrawn"/>; <see cref="Plotted"/> have values).</summary>
    public int Drawn => Series.Sum(s => s.Points.Length);

    public const string ParameterKind = "parameter";
    public const string ScatterKind = "scatter";

    /// <summary>The <c>by</c> value that asks for one series.</summary>
    public const string NoGrouping = "none";

    /// <summary>A column spans decades (and may get a log axis) when all its values are positive and max/min is at least this.</summary>
    public const double DecadesRatio = 100;
}

/// <summary>What to plot against a swept parameter (null picks a default).</summary>
public sealed record ParameterPlotRequest(string? X = null, string? Y = null, string? By = null, AxisScale XScale = AxisScale.Auto, AxisScale YScale = AxisScale.Auto);

/// <summary>What to plot as a scatter, and which direction is better on each axis for the Pareto front.</summary>
public sealed record ScatterPlotRequest(string? X = null, string? Y = null, bool XLarger = true, bool YLarger = true, AxisScale XScale = AxisScale.Auto, AxisScale YScale = AxisScale.Auto);
