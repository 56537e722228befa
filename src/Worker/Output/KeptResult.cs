using System.Collections.Immutable;
using LatticeSweep.Engine.Results;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// What a chunk keeps of a solved point until the chunk's rows are built: the Engine's result without
/// the per-row arrays of tables the sweep does not write (the DOS curve, thermal rows, displacements,
/// dispersion, modes, a sample's layers and layer DOS). Every value a written table reads stays.
/// </summary>
/// <remarks>
/// A chunk holds its points' results from the first point solved to its parts written (up to 4,096
/// points): long enough for the GC to move them to its oldest generation, where they die and wait for a
/// background collection, so what a chunk holds sets how far that generation grows per chunk. For the
/// trivial points of a 10^6-point sweep that writes only points/ and sound_speeds/, the arrays left out
/// were most of each result (bench/README, round 23).
/// </remarks>
internal static class KeptResult
{
    /// <summary><paramref name="result"/> with the arrays no table of <paramref name="outputs"/> reads left empty.</summary>
    public static PointResult For(PointResult result, OutputSelection outputs)
    {
        ArgumentNullException.ThrowIfNull(result);
        ArgumentNullException.ThrowIfNull(outputs);

        // layer_dos/ takes its frequencies from the DOS curve; points/ reads only the curve's method.
        var dos = outputs.Dos || outputs.LayerDos || result.Dos.FrequencyThz.IsDefaultOrEmpty
            ? result.Dos
            : result.Dos with { FrequencyThz = [], Total = [], PartialBySite = [] };
        var surface = result.Surface is { } s && !(outputs.Layers && outputs.LayerDos)
            ? s with { Layers = outputs.Layers ? s.Layers : [], LayerDos = outputs.LayerDos ? s.LayerDos : [] }
            : result.Surface;
        var ordered = result.Ordered is { } o ? For(o, outputs) : null;

        return result with
        {
            Dos = dos,
            Thermal = outputs.Thermal ? result.Thermal : Empty(result.Thermal),
            Displacements = outputs.Displacements ? result.Displacements : Empty(result.Displacements),
            Dispersion = outputs.Dispersion ? result.Dispersion : Empty(result.Dispersion),
            Modes = outputs.Modes ? result.Modes : Empty(result.Modes),
            Surface = surface,
            Ordered = ordered,
        };
    }

    private static ImmutableArray<T> Empty<T>(ImmutableArray<T> items) => items.IsDefaultOrEmpty ? items : [];
}
