using System.Collections.Immutable;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// Which tables a sweep writes. <c>points</c> is always written; <c>cumulative_kappa</c> needs
/// conductivity estimates; <c>layers</c> and <c>layer_dos</c> have rows for samples with a surface.
/// </summary>
public sealed record OutputSelection(bool Dos, bool Thermal, bool Dispersion, bool Modes, bool Displacements, bool CumulativeKappa = false, bool Layers = false, bool LayerDos = false)
{
    public static OutputSelection Default => new(Dos: true, Thermal: true, Dispersion: false, Modes: true, Displacements: true);

    public ImmutableArray<string> TableNames =>
        [
            "points",
            .. Dos ? new[] { "dos" } : [],
            .. Thermal ? new[] { "thermal" } : [],
            .. Dispersion ? new[] { "dispersion" } : [],
            .. Modes ? new[] { "modes" } : [],
            .. Displacements ? new[] { "mean_square_displacements" } : [],
            .. CumulativeKappa ? new[] { "cumulative_kappa" } : [],
            .. Layers ? new[] { "layers" } : [],
            .. LayerDos ? new[] { "layer_dos" } : [],
        ];
}
