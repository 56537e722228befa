namespace LatticeSweep.Engine.Solving;

/// <summary>How the density of states is integrated.</summary>
public enum DosMethod
{
    /// <summary>Linear tetrahedron (3D), triangle (2D) or interval (1D) method for bulk; exact mode histogram for finite crystals.</summary>
    Auto,

    /// <summary>Every mode broadened by a normalised Gaussian of the given width.</summary>
    Gaussian,
}
