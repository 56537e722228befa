namespace LatticeSweep.Audit;

/// <summary>The static lattice of a model with potentials: energy per atom and pressure at the geometry solved, from the kit's own lattice sums.</summary>
internal static class StaticLattice
{
    public static void Check(Context x, string id)
    {
        var m = x.Case.Model;
        if (m.PotentialList.Length == 0)
        {
            return;
        }

        var row = x.PointRow(id);
        var (e, p) = Interactions.Static(m);
        x.Add("static.energy_ev_per_atom", "points/", x.Points.Number("static_energy_ev_per_atom", row), e, 1e-9 * Math.Abs(e) + 1e-12,
            "half the sum of phi (minus phi(cutoff) when shifted) over each site's partners within the cutoff, per atom of the cell (README potentials)");
        if (m.Dimension == 3)
        {
            x.Add("static.pressure_gpa", "points/", x.Points.Number("static_pressure_gpa", row), p, 1e-8 * Math.Abs(p) + 1e-10,
                "-dE/dV under isotropic scaling: -(1/(3V)) (1/2) sum phi'(r) r over the cell's pairs (virial; common practice)");
        }
    }
}
