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

    public ExtendedGenerator(int seed, string[] kinds)
    {
        _kinds = kinds;
        _pairs = new CaseGenerator(seed);
        _bases = new CaseGenerator(seed + 1000003);
        _choose = new Random(seed ^ 0x2626);
        _rng = new Random(unchecked(seed * 7 + 26));
    }

    public static string[] Parse(string? text)
    {
        var kinds = (text ?? "pairs").Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
        if (kinds.Length == 1 && kinds[0] == "all")
        {
            return ["pairs", "surfaces", "interactions"];
        }

        var bad = kinds.Where(k => k is not ("pairs" or "surfaces" or "interactions")).ToList();
        if (kinds.Length == 0 || bad.Count > 0)
        {
            throw new ArgumentException($"AUDIT_KINDS: '{text}' is not a comma-separated list of pairs, surfaces, interactions (or all)");
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

    private double Uniform(double lo, double hi) => lo + (hi - lo) * _rng.NextDouble();

    private double LogUniform(double lo, double hi) => Math.Exp(Uniform(Math.Log(lo), Math.Log(hi)));
}
