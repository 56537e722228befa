namespace LatticeSweep.Audit;

/// <summary>
/// The case kinds AUDIT_KINDS selects (docs/audit/README.md): `pairs` (the original pair-spring cases, drawn exactly
/// as before from the seed), `surfaces` (films, ribbons, wires, boxes, spheres and cylinders with free surfaces) and
/// `interactions` (bends and pair potentials on bulk and periodic finite crystals). The new kinds draw their base
/// models from a generator of their own (seed + 1000003) and their additions from a third stream, so a seed's pair
/// cases stay the same whatever else is asked for. The models are invented; they describe no material.
/// </summary>
internal sealed class ExtendedGenerator
{
    private const int MaxAtoms = 200;
    private readonly string[] _kinds;
    private readonly CaseGenerator _pairs;
    private readonly CaseGenerator _bases;
    private readonly Random _choose;
    private readonly Random _rng;
    private readonly Random _rng27;
    private readonly BendCases _bends29;
    private readonly int _seed;
    private ExtendedGenerator? _surfaces30;
    private Random? _threshold30;

    public ExtendedGenerator(int seed, string[] kinds)
    {
        _seed = seed;
        _kinds = kinds;
        _pairs = new CaseGenerator(seed);
        _bases = new CaseGenerator(seed + 1000003);
        _choose = new Random(seed ^ 0x2626);
        _rng = new Random(unchecked(seed * 7 + 26));
        _rng27 = new Random(unchecked(seed * 11 + 27)); // the kinds added in round 27 (disorder, expansion): a stream of their own
        _bends29 = new BendCases(seed); // the kinds added in round 29 (flexshells, folded): a stream of their own
    }

    public static string[] Parse(string? text)
    {
        var kinds = (text ?? "pairs").Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
        if (kinds.Length == 1 && kinds[0] == "all")
        {
            return ["pairs", "surfaces", "interactions"];
        }

        if (kinds.Length == 1 && kinds[0] == "everything")
        {
            return ["pairs", "surfaces", "interactions", "disorder", "expansion", "flexural"];
        }

        // `everything` stays the six kinds it named before round 29: adding kinds to it would change which kind each of a
        // seed's cases draws (one shared choice stream), so earlier seeds' cases would move; the round-29 kinds are named
        var bad = kinds.Where(k => k is not ("pairs" or "surfaces" or "interactions" or "disorder" or "expansion" or "flexural" or "flexshells" or "folded" or "surfacelayers")).ToList();
        if (kinds.Length == 0 || bad.Count > 0)
        {
            throw new ArgumentException($"AUDIT_KINDS: '{text}' is not a comma-separated list of pairs, surfaces, interactions, disorder, expansion, flexural, flexshells, folded, surfacelayers (or all: the first three; everything: the first six)");
        }

        return kinds;
    }

    public AuditCase Next(string id)
    {
        var kind = _kinds.Length == 1 ? _kinds[0] : _kinds[_choose.Next(_kinds.Length)];
        return kind switch
        {
            "pairs" => _pairs.Next(id),
            "surfaces" => WithSurface(_bases.Next(id)),
            "disorder" => WithDisorder(_bases.Next(id)),
            "expansion" => ExpansionCase(id),
            "flexural" => FlexuralCase(id),
            "flexshells" => _bends29.Flexural(id),
            "folded" => _bends29.Folded(id),
            "surfacelayers" => SurfaceLayersCase(id),
            _ => WithInteractions(_bases.Next(id)),
        };
    }

    private AuditCase WithInteractions(AuditCase c)
    {
        var m = c.Model with { Motion = "3d" };
        var potentials = new List<AuditPotential>();
        var count = _rng.NextDouble() < 0.7 ? 1 : 2;
        for (var k = 0; k < count; k++)
        {
            var p = DrawPotential(m);
            if (potentials.All(q => !q.Joins(p.From, p.To)))
            {
                potentials.Add(p);
            }
        }

        m = m with { Potentials = [.. potentials] };
        var bends = new List<AuditBend>();
        var bendCount = _rng.Next(0, 3);
        for (var k = 0; k < bendCount; k++)
        {
            var b = DrawBend(m);
            if (b is not null && bends.All(q => q.Centre != b.Centre || q.Ends.Length != b.Ends.Length || !q.Ends.SequenceEqual(b.Ends)))
            {
                bends.Add(b);
            }
        }

        return c with { Model = m with { Bends = [.. bends] }, Kind = "interactions" };
    }

    private AuditPotential DrawPotential(AuditModel m)
    {
        var r = m.Sites.Length;
        var i = _rng.Next(r);
        var j = _rng.Next(r);
        var from = m.Sites[i].Label;
        var to = m.Sites[j].Label;
        var pairs = Interactions.Around(m, i).Where(n => m.Sites[n.Site].Label == to).ToList();
        var d0 = pairs[0].R;
        var rmin = d0 / Uniform(1.0, 1.05); // the nearest pair a little stretched: phi' > 0, a positive tension term
        var target = LogUniform(1, 15) / Interactions.NPerMPerEvPerNm2; // phi'' at the minimum, eV/nm^2
        var form = new[] { "lennard_jones", "morse", "buckingham" }[_rng.Next(3)];
        double cutoff;
        var tries = 0;
        do
        {
            cutoff = d0 * Uniform(1.2, 1.8);
        }
        while (++tries < 50 && Interactions.Around(m, i).Concat(Interactions.Around(m, j))
                   .Any(n => Math.Abs(n.R - cutoff) < 2e-4)); // no pair at the cutoff within round-off

        var shift = _rng.NextDouble() < 0.7;
        switch (form)
        {
            case "lennard_jones":
                // phi'' at r_min = 2^(1/6) sigma is 72 eps / r_min^2
                return new AuditPotential(from, to, form, target * rmin * rmin / 72, rmin / Math.Pow(2, 1.0 / 6), 0, 0, 0, 0, 0, cutoff, shift);
            case "morse":
            {
                var a = Uniform(3, 6) / rmin;
                return new AuditPotential(from, to, form, target / (2 * a * a), 0, rmin, a, 0, 0, 0, cutoff, shift);
            }

            default:
            {
                // minimum at r_min: C = A r^7 e^(-r/rho) / (6 rho); phi'' there = A e^(-x) (1 - 7/x) / rho^2, x = r_min / rho
                var x = Uniform(9, 12);
                var rho = rmin / x;
                var amp = target * rho * rho * Math.Exp(x) / (1 - 7 / x);
                var c6 = amp * Math.Pow(rmin, 7) * Math.Exp(-x) / (6 * rho);
                return new AuditPotential(from, to, form, 0, 0, 0, 0, amp, rho, c6, cutoff, shift);
            }
        }
    }

    private AuditBend? DrawBend(AuditModel m)
    {
        var r = m.Sites.Length;
        var c = _rng.Next(r);
        var centre = m.Sites[c].Label;
        var form = _rng.NextDouble() < 0.5 ? "keating" : "angle";
        var k = LogUniform(0.5, 15);
        if (r == 1 || _rng.NextDouble() < 0.5)
        {
            // ends of the centre's own kind: its lattice images, shell 1 (opposite pairs: straight bends) or shells 1 and 2
            int[] shells = _rng.NextDouble() < 0.7 ? [1] : [1, 2];
            return Interactions.Shell(m, c, centre, 1).Count >= 2 ? new AuditBend(centre, [centre], shells, form, k) : null;
        }

        var a = _rng.Next(r);
        var b = _rng.Next(r);
        return a == b ? null : new AuditBend(centre, [m.Sites[a].Label, m.Sites[b].Label], [1], form, k);
    }

    /// <summary>
    /// Round 30: a surfaces case drawn exactly as that kind draws them, but by a generator of its own (seed * 17 + 30, so no
    /// earlier kind's stream moves), with `layer_dos` among the tables and, half the time, a surface weight threshold of
    /// 0.1-0.9 (a fifth of those exactly 0.5, the default, written out) from a stream of its own.
    /// </summary>
    private AuditCase SurfaceLayersCase(string id)
    {
        _surfaces30 ??= new ExtendedGenerator(unchecked(_seed * 17 + 30), ["surfaces"]);
        _threshold30 ??= new Random(unchecked(_seed * 19 + 30));
        var c = _surfaces30.WithSurface(_surfaces30._bases.Next(id));
        var roll = _threshold30.NextDouble();
        double? threshold = roll < 0.5 ? null : roll < 0.6 ? 0.5 : Math.Round(0.1 + 0.8 * _threshold30.NextDouble(), 3);
        return c with { Kind = "surfacelayers", SurfaceWeightThreshold = threshold };
    }

    private AuditCase WithSurface(AuditCase c)
    {
        var m = c.Model;
        if (m.Motion == "3d" && _rng.NextDouble() < 0.25)
        {
            var b = DrawBend(m);
            if (b is not null)
            {
                m = m with { Bends = [b] };
            }
        }

        if (_rng.NextDouble() < 0.2)
        {
            m = m with { Potentials = [DrawPotential(m)] };
        }

        var d = m.Dimension;
        var shortest = m.Vectors().Take(d).Min(v => Math.Sqrt(v.Sum(e => e * e)));
        var shape = d == 3 ? new[] { "box", "box", "sphere", "cylinder" }[_rng.Next(4)] : "box";
        for (var attempt = 0; ; attempt++)
        {
            AuditSurface s;
            if (shape == "box")
            {
                var boundaries = new string[3];
                do
                {
                    for (var k = 0; k < 3; k++)
                    {
                        boundaries[k] = k < d && _rng.NextDouble() < 0.6 ? "free" : "periodic";
                    }
                }
                while (Enumerable.Range(0, d).All(k => boundaries[k] == "periodic"));

                var (lo, hi) = d switch { 1 => (3, 40), 2 => (2, 10), _ => (2, 5) };
                var cells = new int[3];
                for (var k = 0; k < 3; k++)
                {
                    cells[k] = k < d ? _rng.Next(lo, hi + 1) : 1;
                }

                s = new AuditSurface("box", cells, boundaries, 0, 0, [0, 0, 0]);
            }
            else
            {
                var centre = new double[3];
                if (_rng.NextDouble() < 0.5)
                {
                    for (var k = 0; k < d; k++)
                    {
                        centre[k] = Math.Round(Uniform(-0.5, 0.5), 3);
                    }
                }

                var radius = Math.Round(shortest * Uniform(1.05, shape == "sphere" ? 2.4 : 1.8), 4);
                var axis = _rng.Next(1, 4);
                var cells = new int[3];
                cells[axis - 1] = _rng.Next(2, 7);
                s = new AuditSurface(shape, cells, ["free", "free", "free"], radius, axis, centre);
                if (Cluster.TieGap(m, s) < 2e-4)
                {
                    continue;
                }
            }

            var atoms = Cluster.AtomCount(m, s);
            if ((atoms >= 4 && atoms * m.Components <= 3 * MaxAtoms) || attempt > 200)
            {
                return c with { Model = m, Kind = "surfaces", Surface = s };
            }
        }
    }

    /// <summary>
    /// A one-site crystal held by one pair potential alone (fcc, bcc, a triangular sheet moving in its plane, a chain with
    /// scalar motion: lattices these central potentials keep stable), relaxed half the time, with [output.expansion] and
    /// temperatures scaled to the well depth (0 to a fifth of it), so the quasi-harmonic range holds for most of them.
    /// </summary>
    private AuditCase ExpansionCase(string id)
    {
        var r = _rng27;
        double U(double lo, double hi) => lo + (hi - lo) * r.NextDouble();
        var roll = r.NextDouble();
        var (lattice, dim, motion) = roll < 0.35 ? ("fcc", 3, "3d") : roll < 0.55 ? ("bcc", 3, "3d") : roll < 0.8 ? ("hexagonal", 2, "in_plane") : ("chain", 1, "scalar");
        var a = Math.Round(Math.Exp(U(Math.Log(0.25), Math.Log(0.6))), 4);
        var site = new AuditSite("X", [0, 0, 0], Math.Round(Math.Exp(U(Math.Log(4), Math.Log(200))), 4));
        var m = new AuditModel(lattice, dim, a, null, motion, [site], [], []);
        var around = Interactions.Around(m, 0);
        var d0 = around[0].R;
        var rmin = d0 / U(0.98, 1.03);
        var target = Math.Exp(U(Math.Log(1), Math.Log(15))) / Interactions.NPerMPerEvPerNm2;
        var strain = Math.Round(U(0.01, 0.05), 4);
        var shift = r.NextDouble() < 0.7;
        var form = new[] { "lennard_jones", "morse", "buckingham" }[r.Next(3)];
        var width = U(3, 6);
        var bx = U(9, 12);
        AuditPotential p;
        var tries = 0;
        while (true)
        {
            var ratio = U(1.2, 1.8);
            var cutoff = Math.Round(d0 * ratio, 5);
            p = Potential(form, rmin, target, width, bx, cutoff, shift);
            // no shell within 4 % of the cutoff at the static minimum, nor crossing it over the volumes the engine may solve
            // at first (largest_strain, at most 8 %): E_static jumps or kinks there and a minimum could sit on the jump
            var sMin = Expansion.StaticMinimum(m with { Potentials = [p] });
            var reach = Math.Min(0.04 + strain, 0.08);
            if (around.All(n => Math.Abs(n.R * sMin / cutoff - 1) > reach) || ++tries > 40)
            {
                break;
            }
        }

        m = m with { Potentials = [p] };
        var depthK = -p.At(rmin).Phi * 1.602176634e-19 / Units.Kb;
        double[] temps = [0, .. new[] { 0.005, 0.02, 0.06, 0.12, 0.2 }.Select(f => Math.Round(f * depthK, 3))];
        var reference = temps[r.Next(1, temps.Length)];
        var (cells, mesh) = dim switch
        {
            3 => (r.Next(3, 6), r.Next(8, 13)),
            2 => (r.Next(6, 13), r.Next(16, 25)),
            _ => (r.Next(16, 61), r.Next(32, 65)),
        };
        var expansion = new AuditExpansion(r.Next(5, 12), strain, r.NextDouble() < 0.5);
        int[] Repeat(int v) => [.. Enumerable.Repeat(v, dim)];
        return new AuditCase(id, m, temps, reference, Repeat(cells), Repeat(mesh), [[0, 0, 0], [0.5, 0, 0]], 8, 100, "expansion", Expansion: expansion);
    }

    /// <summary>
    /// A one-site sheet (triangular, or square with its diagonals) with central springs in its plane (no transverse
    /// constant) and one flexural bend (shell 1 of its own images): its out-of-plane branch is omega ~ q^2 (README
    /// bends). Temperatures reach down to 0.01 K, where the plate's linear Cv shows.
    /// </summary>
    private AuditCase FlexuralCase(string id)
    {
        var r = _rng27;
        double U(double lo, double hi) => lo + (hi - lo) * r.NextDouble();
        double LogU(double lo, double hi) => Math.Exp(U(Math.Log(lo), Math.Log(hi)));
        var lattice = r.NextDouble() < 0.5 ? "hexagonal" : "square";
        var a = Math.Round(LogU(0.25, 0.6), 4);
        var site = new AuditSite("S0", [0, 0, 0], Math.Round(LogU(1, 200), 4));
        var k1 = Math.Round(LogU(2, 80), 4);
        var shells = new List<ShellSpring> { new("S0", "S0", 1, k1, 0) };
        if (lattice == "square" || r.NextDouble() < 0.4)
        {
            shells.Add(new ShellSpring("S0", "S0", 2, Math.Round(k1 * U(0.2, 1), 4), 0));
        }

        // shell 1 only: a bend on shell 2 alone (square diagonals, triangular sqrt(3) pairs) leaves the out-of-plane
        // motion of two or three sublattices uncoupled, a second plate valley at the zone corner (Round 27 finding)
        var bend = new AuditBend("S0", ["S0"], [1], "flexural", Math.Round(LogU(0.5, 15), 4));
        var m = new AuditModel(lattice, 2, a, null, "3d", [site], [], [.. shells], [bend]);
        var temps = new List<double> { 0.01, 0.05, 0.5, Math.Round(U(1, 3), 3), Math.Round(U(3, 60), 3), Math.Round(U(60, 300), 3), 1000 };
        var reference = temps[r.Next(temps.Count)];
        int[] cells = [r.Next(4, 15), r.Next(4, 15)];
        var n = r.Next(8, 25);
        int[] mesh = r.NextDouble() < 0.7 ? [n, n] : [n, r.Next(8, 25)];
        double[][] path = [[0, 0, 0], [0.5, 0, 0], lattice == "hexagonal" ? [1.0 / 3, 1.0 / 3, 0] : [0.5, 0.5, 0]];
        return new AuditCase(id, m, [.. temps], reference, cells, mesh, path, 12, r.Next(60, 301), "flexural");
    }

    private static AuditPotential Potential(string form, double rmin, double target, double width, double x, double cutoff, bool shift)
    {
        switch (form)
        {
            case "lennard_jones":
                // phi'' at r_min = 2^(1/6) sigma is 72 eps / r_min^2
                return new AuditPotential("X", "X", form, target * rmin * rmin / 72, rmin / Math.Pow(2, 1.0 / 6), 0, 0, 0, 0, 0, cutoff, shift);
            case "morse":
            {
                var w = width / rmin;
                return new AuditPotential("X", "X", form, target / (2 * w * w), 0, rmin, w, 0, 0, 0, cutoff, shift);
            }

            default:
            {
                // minimum at r_min: C = A r^7 e^(-x) / (6 rho), phi'' there A e^(-x) (1 - 7/x) / rho^2, x = r_min / rho
                var rho = rmin / x;
                var amp = target * rho * rho * Math.Exp(x) / (1 - 7 / x);
                return new AuditPotential("X", "X", form, 0, 0, 0, 0, amp, rho, amp * Math.Pow(rmin, 7) * Math.Exp(-x) / (6 * rho), cutoff, shift);
            }
        }
    }

    /// <summary>A box (all periodic half the time, else some directions free) of at most 120 atoms with one or two substituted sites (README disorder).</summary>
    private AuditCase WithDisorder(AuditCase c)
    {
        var m = c.Model;
        var r = _rng27;
        var d = m.Dimension;
        var boundaries = new[] { "periodic", "periodic", "periodic" };
        if (r.NextDouble() < 0.5)
        {
            do
            {
                for (var k = 0; k < d; k++)
                {
                    boundaries[k] = r.NextDouble() < 0.6 ? "free" : "periodic";
                }
            }
            while (Enumerable.Range(0, d).All(k => boundaries[k] == "periodic"));
        }

        var (lo, hi) = d switch { 1 => (4, 40), 2 => (2, 8), _ => (2, 4) };
        var cells = new int[3];
        for (var k = 0; k < 3; k++)
        {
            cells[k] = k < d ? r.Next(lo, hi + 1) : 1;
        }

        while (cells.Aggregate(1, (a, b) => a * b) * m.Sites.Length > 120)
        {
            var k = Array.IndexOf(cells, cells.Max());
            cells[k]--;
        }

        var surface = new AuditSurface("box", cells, boundaries, 0, 0, [0, 0, 0]);
        var sites = Enumerable.Range(0, m.Sites.Length).OrderBy(_ => r.Next()).Take(m.Sites.Length > 1 && r.NextDouble() < 0.3 ? 2 : 1).ToList();
        var subs = new List<AuditSubstitution>();
        foreach (var i in sites)
        {
            var roll = r.NextDouble();
            var conc = roll < 0.08 ? 0.0 : roll < 0.16 ? 1.0 : Math.Round(0.03 + 0.94 * r.NextDouble(), 3);
            var mass = Math.Round(Math.Exp(Math.Log(1) + (Math.Log(200) - Math.Log(1)) * r.NextDouble()), 4);
            var factor = r.NextDouble() < 0.5 ? 1.0 : Math.Round(Math.Exp(Math.Log(0.3) + (Math.Log(3) - Math.Log(0.3)) * r.NextDouble()), 4);
            subs.Add(new AuditSubstitution(i, m.Sites[i].Label, mass, conc, factor));
        }

        var disorder = new AuditDisorder(r.Next(8, 25), r.Next(0, 1000), [.. subs]);
        return c with { Kind = "disorder", Surface = surface, Disorder = disorder };
    }

    private double Uniform(double lo, double hi) => lo + (hi - lo) * _rng.NextDouble();

    private double LogUniform(double lo, double hi) => Math.Exp(Uniform(Math.Log(lo), Math.Log(hi)));
}
