namespace LatticeSweep.Engine.Interactions;

/// <summary>
/// Three-body bond-bending springs: every site of kind <see cref="CentreKind"/> bends every pair
/// of its neighbours formed by one site of kind <see cref="EndKind"/> in its distance shell
/// <see cref="Shell"/> (1 = nearest sites of that kind) and one of kind <see cref="OtherEndKind"/>
/// in shell <see cref="OtherShell"/> (by default the same kind and shell: every pair of that shell).
/// The energy of each pair is given by <see cref="Form"/> with the constant <see cref="ConstantNPerM"/>
/// (N/m); the angles are those of the structure's own geometry.
/// </summary>
public sealed record BendSpring(string CentreKind, string EndKind, int Shell, BendForm Form, double ConstantNPerM)
{
    /// <summary>Kind of the second end; null = <see cref="EndKind"/>.</summary>
    public string? OtherEndKind { get; init; }

    /// <summary>Shell of the second end; null = <see cref="Shell"/>.</summary>
    public int? OtherShell { get; init; }

    /// <summary>The second end's kind, resolved.</summary>
    public string SecondKind => OtherEndKind ?? EndKind;

    /// <summary>The second end's shell, resolved.</summary>
    public int SecondShell => OtherShell ?? Shell;

    /// <summary>True when both ends come from one shell of one kind (pairs are then unordered pairs of that shell).</summary>
    public bool SameEnds => SecondKind == EndKind && SecondShell == Shell;
}
