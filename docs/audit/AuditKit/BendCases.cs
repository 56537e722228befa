namespace LatticeSweep.Audit;

/// <summary>
/// The kinds added in round 29, drawn from a stream of their own (seed * 13 + 29) so that no earlier kind's cases move:
/// `flexshells`, one-site sheets whose out-of-plane motion is held by flexural bends on shell 1, 2 or 3, or on shells
/// [1, 3] (straight and folded pairs), so that shells 2 and 3 alone leave zero valleys away from q = 0 (README bends);
/// `folded`, one-site square and triangular sheets and simple cubic, bcc and fcc crystals with pair springs on shell 1
/// (a transverse constant down to 0.3 % of the longitudinal one) and an `angle` bend pairing shell 1 with the first
/// shell on the same rays (folded pairs, which stiffen the transverse waves as omega^2 = c^2 q^2 + beta q^4).
/// The models are invented; they describe no material.
/// </summary>
internal sealed class BendCases(int seed)
{
    private readonly Random _r = new(unchecked(seed * 13 + 29));

    public AuditCase Flexural(string id)
    {
        var lattice = _r.NextDouble() < 0.5 ? "hexagonal" : "square";
        var a = Math.Round(LogU(0.25, 0.6), 4);
        var site = new AuditSite("S0", [0, 0, 0], Math.Round(LogU(1, 200), 4));
        var k1 = Math.Round(LogU(2, 80), 4);
        var shells = new List<ShellSpring> { new("S0", "S0", 1, k1, 0) };
        if (lattice == "square" || _r.NextDouble() < 0.4)
        {
            shells.Add(new ShellSpring("S0", "S0", 2, Math.Round(k1 * U(0.2, 1), 4), 0));
        }

        int[][] choices = [[1], [2], [3], [1, 3]];
        var bendShells = choices[_r.Next(choices.Length)];
        var bends = new List<AuditBend> { new("S0", ["S0"], bendShells, "flexural", Math.Round(LogU(0.5, 15), 4)) };
        if (bendShells is [2] or [3] && _r.NextDouble() < 0.3)
        {
            bends.Add(new AuditBend("S0", ["S0"], [1], "flexural", Math.Round(LogU(0.5, 15), 4))); // shell 1 links the sublattices again
        }

        var m = new AuditModel(lattice, 2, a, null, "3d", [site], [], [.. shells], [.. bends]);
        var temps = new List<double> { 0.01, 0.05, 0.5, Math.Round(U(1, 3), 3), Math.Round(U(3, 60), 3), Math.Round(U(60, 300), 3), 1000 };
        var reference = temps[_r.Next(temps.Count)];
        int[] cells = [_r.Next(4, 15), _r.Next(4, 15)];
        // valleys at 1/3, 2/3 (a triangular sheet's shell 2 alone: K) need meshes divisible by 3 (README: others are refused)
        var thirds = lattice == "hexagonal" && bends.Count == 1 && bendShells is [2];
        int Mesh() => thirds ? 3 * _r.Next(3, 11) : _r.Next(8, 33);
        var n = Mesh();
        int[] mesh = _r.NextDouble() < 0.7 ? [n, n] : [n, Mesh()];
        double[][] path = [[0, 0, 0], [0.5, 0, 0], lattice == "hexagonal" ? [1.0 / 3, 1.0 / 3, 0] : [0.5, 0.5, 0]];
        return new AuditCase(id, m, [.. temps], reference, cells, mesh, path, 12, _r.Next(60, 301), "flexshells", Conductivity: DrawConductivity(a));
    }

    public AuditCase Folded(string id)
    {
        var roll = _r.NextDouble();
        var (lattice, dim) = roll < 0.25 ? ("square", 2) : roll < 0.4 ? ("hexagonal", 2) : roll < 0.7 ? ("simple_cubic", 3) : roll < 0.85 ? ("bcc", 3) : ("fcc", 3);
        var a = Math.Round(LogU(0.25, 0.6), 4);
        var site = new AuditSite("S0", [0, 0, 0], Math.Round(LogU(1, 200), 4));
        var kl = Math.Round(LogU(2, 80), 4);
        var kt = Math.Round(kl * LogU(0.003, 0.6), 5);
        var shells = new List<ShellSpring> { new("S0", "S0", 1, kl, kt) };
        if (_r.NextDouble() < 0.3)
        {
            shells.Add(new ShellSpring("S0", "S0", 2, Math.Round(kl * U(0.1, 0.6), 4), Math.Round(kt * U(0.1, 1), 5)));
        }

        var probe = new AuditModel(lattice, dim, a, null, "3d", [site], [], [.. shells]);
        var bend = new AuditBend("S0", ["S0"], [1, FoldedShell(probe)], "angle", Math.Round(LogU(0.5, 15), 4));
        var m = probe with { Bends = [bend] };
        var temps = new List<double> { 0.5, Math.Round(U(1, 3), 3), Math.Round(U(3, 60), 3), 20, Math.Round(U(60, 300), 3), Math.Round(U(300, 1000), 3), 1000 };
        temps = [.. temps.Distinct().Order()];
        var reference = temps[_r.Next(temps.Count)];
        var (cells, mesh) = dim == 2 ? (_r.Next(4, 15), _r.Next(8, 41)) : (_r.Next(2, 7), _r.Next(8, 25));
        int[] Repeat(int v) => [.. Enumerable.Repeat(v, dim)];
        double[][] path = dim == 2
            ? [[0, 0, 0], [0.5, 0, 0], lattice == "hexagonal" ? [1.0 / 3, 1.0 / 3, 0] : [0.5, 0.5, 0]]
            : [[0, 0, 0], [0.5, 0, 0], [0.5, 0.5, 0.5]];
        return new AuditCase(id, m, [.. temps], reference, Repeat(cells), Repeat(mesh), path, 10, _r.Next(60, 301), "folded", Conductivity: DrawConductivity(a));
    }

    /// <summary>One relaxation time of 1-100 ps (log-uniform) and, for sheets, a thickness of 0.5-2 lattice constants.</summary>
    private AuditConductivity DrawConductivity(double a) => new(Math.Round(LogU(1, 100), 4), Math.Round(a * U(0.5, 2), 4));

    /// <summary>The first shell beyond 1 with a site on a ray of shell 1 (the same direction, farther out): a folded pair with it.</summary>
    private static int FoldedShell(AuditModel m)
    {
        var first = Interactions.Shell(m, 0, "S0", 1);
        for (var s = 2; s <= 12; s++)
        {
            var shell = Interactions.Shell(m, 0, "S0", s);
            if (shell.Any(o => first.Any(f => Cos(f.D, o.D) > 1 - 1e-9)))
            {
                return s;
            }
        }

        throw new InvalidOperationException($"no folded shell found for {m.Lattice}");
    }

    private static double Cos(double[] u, double[] v) =>
        (u[0] * v[0] + u[1] * v[1] + u[2] * v[2]) / Math.Sqrt((u[0] * u[0] + u[1] * u[1] + u[2] * u[2]) * (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]));

    private double U(double lo, double hi) => lo + (hi - lo) * _r.NextDouble();

    private double LogU(double lo, double hi) => Math.Exp(U(Math.Log(lo), Math.Log(hi)));
}
