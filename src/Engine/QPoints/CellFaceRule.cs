using System.Collections.Immutable;

namespace LatticeSweep.Engine.QPoints;

/// <summary>
/// How the faces of a centred cell are integrated by <see cref="CentredCellRays"/>: either the same
/// Gauss-Legendre product rule of <see cref="Nodes"/> per direction on every whole face, or that rule on
/// each of <see cref="Panels"/>, rectangles of the faces chosen where the direction integrand needs them
/// (Dos/LongWaveFaceRule.Panels.cs). Panels let a rule follow kinks and narrow ridges of the integrand
/// (acoustic branches crossing on symmetry axes and mirror planes) that a rule on the whole face
/// resolves only slowly.
/// </summary>
internal sealed record CellFaceRule
{
    private CellFaceRule(int nodes, ImmutableArray<FacePanel> panels)
    {
        Nodes = nodes;
        Panels = panels;
    }

    /// <summary>Gauss-Legendre nodes per face direction (of each panel when panelled).</summary>
    public int Nodes { get; }

    /// <summary>The panels, or empty for a rule on the whole faces.</summary>
    public ImmutableArray<FacePanel> Panels { get; }

    public bool IsPanelled => !Panels.IsEmpty;

    /// <summary>The rule of <paramref name="nodes"/> per direction on each whole face.</summary>
    public static CellFaceRule Uniform(int nodes)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(nodes, 1);
        return new CellFaceRule(nodes, []);
    }

    /// <summary>The rule of <paramref name="nodes"/> per direction on each panel; the panels must tile the d faces once.</summary>
    public static CellFaceRule Panelled(int nodes, IEnumerable<FacePanel> panels)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(nodes, 1);
        var list = panels.ToImmutableArray();
        if (list.IsEmpty)
        {
            throw new ArgumentException("A panelled face rule needs at least one panel.", nameof(panels));
        }

        return new CellFaceRule(nodes, list);
    }

    /// <summary>How many rays the rule makes in a cell of this dimension.</summary>
    public int RayCount(int dimension)
    {
        var perPanel = (int)Math.Pow(Nodes, dimension - 1);
        return (IsPanelled ? Panels.Length : dimension) * perPanel;
    }
}

/// <summary>
/// A rectangle [S0, S1] x [T0, T1] of face <see cref="Face"/> of a centred cell, in the face's coordinates
/// (each in [-1/2, 1/2], along the two other edges in order; a 2D cell's faces are edges and use S only).
/// </summary>
internal readonly record struct FacePanel(int Face, double S0, double S1, double T0, double T1)
{
    /// <summary>A whole face.</summary>
    public static FacePanel Whole(int face, int dimension) =>
        new(face, -0.5, 0.5, dimension == 3 ? -0.5 : 0, dimension == 3 ? 0.5 : 0);

    /// <summary>The two halves of the panel split across direction 0 (S) or 1 (T).</summary>
    public (FacePanel Lower, FacePanel Upper) Halves(int direction)
    {
        if (direction == 0)
        {
            var s = (S0 + S1) / 2;
            return (this with { S1 = s }, this with { S0 = s });
        }

        var t = (T0 + T1) / 2;
        return (this with { T1 = t }, this with { T0 = t });
    }
}
