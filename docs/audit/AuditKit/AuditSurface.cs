namespace LatticeSweep.Audit;

/// <summary>
/// A sample with free surfaces (README "Free surfaces, shapes and the real-space solver"): a box of Cells with a
/// boundary per lattice direction, a sphere of RadiusNm around the centre, or a cylinder of RadiusNm around the
/// axis through the centre along lattice direction Axis (1-based), Cells along it, periodic along it.
/// The centre is site 0 (at the origin) moved by CentreFraction (fractions of the lattice vectors).
/// </summary>
internal sealed record AuditSurface(string Shape, int[] Cells, string[] Boundaries, double RadiusNm, int Axis, double[] CentreFraction)
{
    /// <summary>Whether lattice direction k (0-based) is periodic (its cells wrap).</summary>
    public bool Periodic(int k) => Shape switch
    {
        "sphere" => false,
        "cylinder" => k == Axis - 1,
        _ => Boundaries[k] == "periodic",
    };
}
