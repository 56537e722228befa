namespace LatticeSweep.Audit;

/// <summary>
/// Random cases from a seed: every lattice the engine builds in (chain; square and hexagonal sheets;
/// simple cubic, bcc, fcc, hexagonal 3D), 3d / in-plane / scalar motion, one to four sites, springs by
/// shell (one-site cells) or explicit bonds, random masses, springs, meshes (odd and even) and
/// temperatures from 0.5 to 1000 K. Every spring has positive longitudinal and transverse constants and
/// the bonds join every site and every lattice direction, so each model is stable and has no zero modes
/// besides the rigid translations (the audit checks the engine's numbers, not its refusal of bad models).
/// </summary>
internal sealed class CaseGenerator(int seed)
{
    private readonly Random _rng = new(seed);

    public AuditCase Next(string id)
    {
        var dim = Pick((1, 0.2), (2, 0.3), (3, 0.5));
        var lattice = dim switch
        {
            1 => "chain",
            2 => _rng.NextDouble() < 0.5 ? "square" : "hexagonal",
            _ => Pick(("simple_cubic", 0.25), ("bcc", 0.25), ("fcc", 0.25), ("hexagonal", 0.25)),
        };
        var a = Round(LogUniform(0.25, 0.6), 4);
        double? c = dim == 3 && lattice == "hexagonal" ? Round(a * Uniform(0.8, 1.8), 4) : null;
        var motion = _rng.NextDouble() < 0.15 ? "scalar" : dim == 2 && _rng.NextDouble() < 0.3 ? "in_plane" : "3d";
        var maxSites = dim == 1 ? 4 : 3;
        var r = _rng.NextDouble() < 0.35 ? 1 : _rng.Next(2, maxSites + 1);

        var probe = new AuditModel(lattice, dim, a, c, motion, [], [], []);
        var sites = new List<AuditSite>();
        var tries = 0;
        while (sites.Count < r)
        {
            if (++tries % 200 == 0)
            {
                sites.Clear(); // the sites placed so far leave no room for the next: start again
            }

            var frac = new double[3];
            for (var k = 0; k < dim; k++)
            {
                frac[k] = sites.Count == 0 ? 0 : Round(_rng.NextDouble(), 3);
            }

            if (sites.All(s => MinImageDistance(probe, s.Fraction, frac) > 0.2 * a))
            {
                sites.Add(new AuditSite($"S{sites.Count}", frac, Round(LogUniform(1, 200), 4)));
            }
        }

        var bonds = new List<AuditBond>();
        var shells = new List<ShellSpring>();
        if (r == 1 && _rng.NextDouble() < 0.6)
        {
            shells.Add(Shell(1));
            if (_rng.NextDouble() < 0.4)
            {
                shells.Add(Shell(2));
            }

            // a 3D hexagonal lattice's nearest shell may lie in the plane only: add shells until the bonds span
            while (!Spans(probe with { Sites = [.. sites], Shells = [.. shells] }))
            {
                shells.Add(Shell(shells.Count + 1));
            }
        }
        else
        {
            var seen = new HashSet<string>();
            void Add(int i, int j, int[] cell)
            {
                if (i == j && cell.All(x => x == 0))
                {
                    return;
                }

                var key = $"{i}:{j}:{string.Join(",", cell)}";
                var reverse = $"{j}:{i}:{string.Join(",", cell.Select(x => -x))}";
                if (!seen.Add(key) || seen.Contains(reverse))
                {
                    return;
                }

                var kl = Round(LogUniform(2, 80), 4);
                bonds.Add(new AuditBond(i, j, cell, kl, Round(kl * Uniform(0.05, 0.6), 4)));
            }

            // every site joined to an earlier one, every lattice direction spanned
            for (var i = 1; i < r; i++)
            {
                Add(_rng.Next(i), i, RandomCell(dim, allowZero: true));
            }

            // a site joined to its own image along each lattice vector: the loops of the bond network then
            // span the lattice, so no plane wave leaves every spring unstretched (no zero modes besides
            // q = 0; a network whose loops span fewer directions is floppy along whole lines of q)
            for (var k = 0; k < dim; k++)
            {
                var cell = new int[3];
                cell[k] = 1;
                var site = _rng.Next(r);
                Add(site, site, cell);
            }

            var extra = _rng.Next(0, 4);
            for (var e = 0; e < extra; e++)
            {
                Add(_rng.Next(r), _rng.Next(r), RandomCell(dim, allowZero: true));
            }
        }

        var model = probe with { Sites = [.. sites], Bonds = [.. bonds], Shells = [.. shells] };

        var temps = new SortedSet<double>
        {
            0.5,
            Round(LogUniform(1, 3), 3),
            Round(LogUniform(3, 60), 3),
            Round(LogUniform(3, 60), 3),
            Round(LogUniform(60, 300), 3),
            Round(LogUniform(300, 1000), 3),
            1000,
        };
        var temperatures = temps.ToArray();
        var reference = temperatures[_rng.Next(temperatures.Length)];

        var (cellLo, cellHi, meshLo, meshHi) = dim switch
        {
            1 => (6, 60, 16, 64),
            2 => (4, 14, 8, 24),
            _ => (2, 6, 8, 16),
        };
        var cells = Enumerable.Range(0, dim).Select(_ => _rng.Next(cellLo, cellHi + 1)).ToArray();
        var meshOne = _rng.Next(meshLo, meshHi + 1);
        var mesh = _rng.NextDouble() < 0.8
            ? Enumerable.Repeat(meshOne, dim).ToArray()
            : Enumerable.Range(0, dim).Select(_ => _rng.Next(meshLo, meshHi + 1)).ToArray();

        var corners = new List<double[]>();
        var count = _rng.Next(2, 4);
        for (var k = 0; k < count; k++)
        {
            var q = new double[3];
            for (var x = 0; x < dim; x++)
            {
                q[x] = k == 0 && _rng.NextDouble() < 0.5 ? 0 : Round(Uniform(-0.5, 0.5), 3);
            }

            corners.Add(q);
        }

        return new AuditCase(id, model, temperatures, reference, cells, mesh, [.. corners], _rng.Next(4, 9), _rng.Next(60, 301));

        ShellSpring Shell(int shell)
        {
            var kl = Round(LogUniform(2, 80), 4);
            return new ShellSpring("S0", "S0", shell, kl, Round(kl * Uniform(0.05, 0.6), 4));
        }
    }

    /// <summary>Whether the bond vectors of a one-site cell span the lattice's dimension (Gram determinant).</summary>
    private static bool Spans(AuditModel model)
    {
        var vectors = DynamicalMatrix.AllBonds(model).Select(b => model.Cartesian([.. b.Cell.Select(v => (double)v)])).ToList();
        var d = model.Dimension;
        var g = new double[3, 3];
        foreach (var v in vectors)
        {
            for (var i = 0; i < 3; i++)
            {
                for (var j = 0; j < 3; j++)
                {
                    g[i, j] += v[i] * v[j];
                }
            }
        }

        var det = d switch
        {
            1 => g[0, 0],
            2 => g[0, 0] * g[1, 1] - g[0, 1] * g[1, 0],
            _ => g[0, 0] * (g[1, 1] * g[2, 2] - g[1, 2] * g[2, 1]) - g[0, 1] * (g[1, 0] * g[2, 2] - g[1, 2] * g[2, 0])
                + g[0, 2] * (g[1, 0] * g[2, 1] - g[1, 1] * g[2, 0]),
        };
        return det > 1e-9 * Math.Pow(model.ConstantNm, 2 * d);
    }

    private int[] RandomCell(int dim, bool allowZero)
    {
        while (true)
        {
            var cell = new int[3];
            for (var k = 0; k < dim; k++)
            {
                cell[k] = _rng.Next(-1, 2);
            }

            if (allowZero || cell.Any(x => x != 0))
            {
                return cell;
            }
        }
    }

    private static double MinImageDistance(AuditModel probe, double[] f1, double[] f2)
    {
        var best = double.PositiveInfinity;
        var d = probe.Dimension;
        for (var x = -1; x <= 1; x++)
        {
            for (var y = d > 1 ? -1 : 0; y <= (d > 1 ? 1 : 0); y++)
            {
                for (var z = d > 2 ? -1 : 0; z <= (d > 2 ? 1 : 0); z++)
                {
                    var r = probe.Cartesian([f2[0] - f1[0] + x, f2[1] - f1[1] + y, f2[2] - f1[2] + z]);
                    best = Math.Min(best, Math.Sqrt(r[0] * r[0] + r[1] * r[1] + r[2] * r[2]));
                }
            }
        }

        return best;
    }

    private T Pick<T>(params (T Value, double Weight)[] choices)
    {
        var u = _rng.NextDouble() * choices.Sum(c => c.Weight);
        foreach (var (value, weight) in choices)
        {
            if ((u -= weight) < 0)
            {
                return value;
            }
        }

        return choices[^1].Value;
    }

    private double Uniform(double lo, double hi) => lo + (hi - lo) * _rng.NextDouble();

    private double LogUniform(double lo, double hi) => Math.Exp(Uniform(Math.Log(lo), Math.Log(hi)));

    private static double Round(double x, int digits) => Math.Round(x, digits);
}
