namespace LatticeSweep.Engine.Builders;

/// <summary>Where the layers of a layered cell sit.</summary>
public enum LayeredHost
{
    /// <summary>A 1D chain with r sites per cell.</summary>
    Chain,

    /// <summary>Square planes of a simple cubic host stacked along z, r planes per cell (a tetragonal cell).</summary>
    CubicStack,
}
