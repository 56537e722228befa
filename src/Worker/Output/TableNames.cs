using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Output;

/// <summary>The result tables (one folder of part files each) under a sweep's folder.</summary>
public static class TableNames
{
    public const string Points = "points";
    public const string SoundSpeeds = "sound_speeds";
    public const string Dos = "dos";
    public const string Thermal = "thermal";
    public const string Dispersion = "dispersion";
    public const string Modes = "modes";
    public const string MeanSquareDisplacements = "mean_square_displacements";

    /// <summary>The former name of <see cref="MeanSquareDisplacements"/>: still accepted in job files and in older catalogs.</summary>
    public const string FormerDisplacements = "displacements";
    public const string CumulativeKappa = "cumulative_kappa";
    public const string Layers = "layers";
    public const string LayerDos = "layer_dos";

    /// <summary>Every table a sweep with these outputs writes, points first. Sound speeds go with points.</summary>
    public static IReadOnlyList<string> For(OutputSelection outputs)
    {
        ArgumentNullException.ThrowIfNull(outputs);
        var names = new List<string> { Points, SoundSpeeds };
        names.AddRange(outputs.TableNames.Where(t => t != Points));
        return names;
    }
}
