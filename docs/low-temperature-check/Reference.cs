using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Springs;
using LatticeSweep.Engine.Units;
using MathNet.Numerics.Integration;

// Round 15 outside check (kept out of Batch.sln). Usage: dotnet run -c Release -- MODE CASES MESHES TEMPERATURES, MODE = low | full | engine | minf | print
// References, none through the engine's DOS or thermal code (only its dynamical matrix, CompiledCrystal + ModeSolver):
//  low:  the T^3 / T^2 law from finite-difference sound speeds (Ashcroft and Mermin ch. 23) and a spherical
//        ray quadrature of the model's eigenvalues inside the zone's inscribed sphere (exact while its edge is frozen);
//  full: the whole zone at any temperature: the same rays weighted by a smooth (C-infinity) window around q = 0,
//        plus a plain mesh sum of the windowed-out remainder, which is smooth and periodic and so converges fast
//        (44^3 and 32^3 agree within 3e-5; common practice, no source);
//  engine: the engine's Cv / S on a mesh (with a fifth argument: and its mesh-change columns).
static class P
{
    static readonly double Kb = PhysicalConstants.BoltzmannJPerK, Hbar = PhysicalConstants.HbarJS, R = PhysicalConstants.GasConstantJPerMolK;

    static double Cmode(double omega, double t)
    {
        var x = Hbar * omega / (Kb * t);
        return x > 700 || x <= 0 ? 0 : x * x / (4 * Math.Pow(Math.Sinh(x / 2), 2));
    }

    public static Dictionary<string, Func<CrystalModel>> Cases()
    {
        var d = new Dictionary<string, Func<CrystalModel>>();
        for (var seed = 1; seed <= 12; seed++)
        {
            var s = seed;
            d[$"hex{s}"] = () => RandomCell(s, Lattice.Hexagonal(0.3, 0.3 * (1.2 + 0.6 * new Random(s * 7).NextDouble())));
        }
        for (var seed = 1; seed <= 4; seed++)
        {
            var s = seed;
            d[$"fccR{s}"] = () => RandomCell(100 + s, Lattice.FaceCentredCubic(0.45));
            d[$"bccR{s}"] = () => RandomCell(200 + s, Lattice.BodyCentredCubic(0.35));
            d[$"scR{s}"] = () => RandomCell(300 + s, Lattice.SimpleCubic(0.35));
        }
        d["fcc1"] = () => CrystalModel.Create(Lattice.FaceCentredCubic(0.4), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10)]);
        d["fcc1t"] = () => CrystalModel.Create(Lattice.FaceCentredCubic(0.4), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10, 1.5), new ShellSpring("A", "A", 2, 2, 0.3)]);
        d["bcc1"] = () => CrystalModel.Create(Lattice.BodyCentredCubic(0.3), [new Site("A", "A", Vec3.Zero, 30)], [new ShellSpring("A", "A", 1, 10, 2), new ShellSpring("A", "A", 2, 5, 1)]);
        d["hcp"] = () => CrystalModel.Create(Lattice.Hexagonal(0.3, 0.49), [new Site("A", "A", Vec3.Zero, 25), new Site("B", "A", new Vec3(1.0 / 3, 1.0 / 3, 0.5), 25)], [new ShellSpring("A", "A", 1, 12, 2), new ShellSpring("A", "A", 2, 4, 0.5)]);
        d["hex1s"] = () => CrystalModel.Create(Lattice.Hexagonal(0.3, 0.4), [new Site("A", "A", Vec3.Zero, 25)], [new ShellSpring("A", "A", 1, 12, 2), new ShellSpring("A", "A", 2, 4, 0.5)]);
        d["sq3d"] = () => CrystalModel.Create(Lattice.Square(0.3), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10, 1), new ShellSpring("A", "A", 2, 4, 0.5)]);
        d["sqip"] = () => CrystalModel.Create(Lattice.Square(0.3), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10, 1), new ShellSpring("A", "A", 2, 4, 0.5)], degreesOfFreedom: DegreesOfFreedom.InPlane);
        d["sqsc"] = () => CrystalModel.Create(Lattice.Square(0.3), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10)], degreesOfFreedom: DegreesOfFreedom.Scalar);
        d["tri"] = () => CrystalModel.Create(Lattice.Hexagonal(0.3), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10, 1)], degreesOfFreedom: DegreesOfFreedom.InPlane);
        d["sq2ip"] = () => RandomCell(400, Lattice.Square(0.35), DegreesOfFreedom.InPlane);
        d["tri2ip"] = () => RandomCell(401, Lattice.Hexagonal(0.35), DegreesOfFreedom.InPlane);
        d["sqbend"] = () => CrystalModel.Create(Lattice.Square(0.3), [new Site("A", "A", Vec3.Zero, 20)], shellSprings: [new ShellSpring("A", "A", 1, 10, 0.0), new ShellSpring("A", "A", 2, 4, 0.0)], bends: [new BendSpring("A", "A", 1, BendForm.Flexural, 2.0)], degreesOfFreedom: DegreesOfFreedom.Cartesian);
        d["rocksalt"] = () => CrystalModel.Create(Lattice.FaceCentredCubic(0.56), [new Site("P", "P", Vec3.Zero, 23), new Site("Q", "Q", new Vec3(0.5, 0.5, 0.5), 35)], [new ShellSpring("P", "Q", 1, 15, 3), new ShellSpring("P", "P", 1, 3), new ShellSpring("Q", "Q", 1, 3)]);
        d["fcc4"] = () => CrystalModel.Create(Lattice.SimpleCubic(0.4), [new Site("A", "A", Vec3.Zero, 20), new Site("B", "A", new Vec3(0.5, 0.5, 0), 20), new Site("C", "A", new Vec3(0.5, 0, 0.5), 20), new Site("D", "A", new Vec3(0, 0.5, 0.5), 20)], [new ShellSpring("A", "A", 1, 10)]);
        d["sc2"] = () => CrystalModel.Create(Lattice.Explicit([new Vec3(0.6, 0, 0), new Vec3(0, 0.3, 0), new Vec3(0, 0, 0.3)]), [new Site("A", "A", Vec3.Zero, 20), new Site("B", "A", new Vec3(0.5, 0, 0), 20)], [new ShellSpring("A", "A", 1, 10, 1), new ShellSpring("A", "A", 2, 2.5, 0.2)]);
        d["scAn"] = () => CrystalModel.Create(Lattice.SimpleCubic(0.3), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10), new ShellSpring("A", "A", 2, 0.5)]);
        d["hexB"] = () => CrystalModel.Create(Lattice.Hexagonal(0.3, 0.43), [new Site("A", "A", Vec3.Zero, 33), new Site("B", "B", new Vec3(0.66, 0.43, 0.77), 28)],
            [new ShellSpring("A", "A", 1, 19, 0.8), new ShellSpring("A", "A", 2, 4.2, 0.23), new ShellSpring("A", "B", 1, 8.7, 1.5), new ShellSpring("A", "B", 2, 6, 0.9), new ShellSpring("B", "B", 1, 15, 1.3), new ShellSpring("B", "B", 2, 4, 0.9)]);
        d["scs"] = () => CrystalModel.Create(Lattice.SimpleCubic(0.3), [new Site("A", "A", Vec3.Zero, 20)], [new ShellSpring("A", "A", 1, 10)], degreesOfFreedom: DegreesOfFreedom.Scalar);
        d["sc4x"] = () => CrystalModel.Create(Lattice.Explicit([new Vec3(1.2, 0, 0), new Vec3(0, 0.3, 0), new Vec3(0, 0, 0.3)]), [new Site("A", "A", Vec3.Zero, 20), new Site("B", "A", new Vec3(0.25, 0, 0), 20), new Site("C", "A", new Vec3(0.5, 0, 0), 20), new Site("D", "A", new Vec3(0.75, 0, 0), 20)], [new ShellSpring("A", "A", 1, 10, 1), new ShellSpring("A", "A", 2, 2.5, 0.2)]);
        d["sc3x"] = () => CrystalModel.Create(Lattice.Explicit([new Vec3(0.9, 0, 0), new Vec3(0, 0.3, 0), new Vec3(0, 0, 0.3)]), [new Site("A", "A", Vec3.Zero, 20), new Site("B", "A", new Vec3(1.0 / 3, 0, 0), 20), new Site("C", "A", new Vec3(2.0 / 3, 0, 0), 20)], [new ShellSpring("A", "A", 1, 10, 1), new ShellSpring("A", "A", 2, 2.5, 0.2)]);
        d["sc4"] = () => RandomCell(500, Lattice.SimpleCubic(0.4), sites: 4);
        return d;
    }

    static CrystalModel RandomCell(int seed, Lattice lattice, DegreesOfFreedom? dof = null, int? sites = null)
    {
        var rng = new Random(seed);
        var n = sites ?? 2 + rng.Next(3);
        var list = new List<Site>();
        for (var i = 0; i < n; i++)
        {
            var z = lattice.Dimension == 3 ? rng.NextDouble() : 0;
            list.Add(new Site($"S{i}", $"K{i % 2}", i == 0 ? Vec3.Zero : new Vec3(rng.NextDouble(), rng.NextDouble(), z), 10 + 50 * rng.NextDouble()));
        }
        var springs = new List<ShellSpring>();
        foreach (var (a, b) in new[] { ("K0", "K0"), ("K0", "K1"), ("K1", "K1") })
        {
            if (n == 1 && b == "K1") continue;
            springs.Add(new ShellSpring(a, b, 1, 5 + 15 * rng.NextDouble(), 0.5 + 3 * rng.NextDouble()));
            springs.Add(new ShellSpring(a, b, 2, 1 + 5 * rng.NextDouble(), 0.2 + 1 * rng.NextDouble()));
        }
        return dof is { } f ? CrystalModel.Create(lattice, [.. list], [.. springs], degreesOfFreedom: f) : CrystalModel.Create(lattice, [.. list], [.. springs]);
    }

    static List<Vec3> Directions(int d, out List<double> w)
    {
        var dirs = new List<Vec3>();
        w = new List<double>();
        if (d == 3)
        {
            var mu = new GaussLegendreRule(-1, 1, 32);
            const int nphi = 64;
            for (var i = 0; i < 32; i++)
                for (var j = 0; j < nphi; j++)
                {
                    var s = Math.Sqrt(1 - mu.Abscissas[i] * mu.Abscissas[i]);
                    var phi = 2 * Math.PI * (j + 0.5) / nphi;
                    dirs.Add(new Vec3(s * Math.Cos(phi), s * Math.Sin(phi), mu.Abscissas[i]));
                    w.Add(mu.Weights[i] / 2 / nphi);
                }
        }
        else
        {
            const int nphi = 256;
            for (var j = 0; j < nphi; j++)
            {
                var phi = 2 * Math.PI * (j + 0.5) / nphi;
                dirs.Add(new Vec3(Math.Cos(phi), Math.Sin(phi), 0));
                w.Add(1.0 / nphi);
            }
        }
        return dirs;
    }

    static double Inscribed(Lattice l)
    {
        var best = double.MaxValue;
        var d = l.Dimension;
        for (var i = -2; i <= 2; i++) for (var j = -2; j <= 2; j++) for (var k = -2; k <= 2; k++)
        {
            if (i == 0 && j == 0 && k == 0) continue;
            if (d < 3 && k != 0) continue;
            var g = i * l.B1PerM + j * l.B2PerM + k * l.B3PerM;
            best = Math.Min(best, g.Length);
        }
        return best / 2;
    }

    // Per mole of atoms: (cell quantity in kB) * R / sites.
    public static (double[] Law, double[] Sphere, double[] SLaw, double[] SSphere, double frozenX) LowReference(CrystalModel model, double[] temps)
    {
        var crystal = CompiledCrystal.From(model);
        var solver = new ModeSolver(new DynamicalMatrix(crystal));
        var l = model.Lattice;
        var d = l.Dimension;
        var ac = crystal.Components;
        var size = crystal.Size;
        var sites = model.Sites.Length;
        var measure = l.CellMeasure; // m^3 or m^2
        var dirs = Directions(d, out var w);
        var qmax = 0.98 * Inscribed(l);
        var eps = 1e-5 * qmax;
        double inv = 0;
        // radial nodes: octaves down from qmax
        var radial = new List<(double q, double wq)>();
        var gl = new GaussLegendreRule(0.5, 1.0, 10);
        for (var o = 0; o < 40; o++)
        {
            var scale = qmax * Math.Pow(0.5, o);
            for (var i = 0; i < 10; i++) radial.Add((gl.Abscissas[i] * scale, gl.Weights[i] * scale));
        }
        var cs = new double[temps.Length];
        var ss = new double[temps.Length];
        var minEdge = double.MaxValue;
        for (var n = 0; n < dirs.Count; n++)
        {
            var u = dirs[n];
            solver.SolveValues(eps * u);
            var a1 = solver.Values.Take(ac).Select(v => Math.Sqrt(Math.Max(v, 0)) / eps).ToArray();
            solver.SolveValues(2 * eps * u);
            var a2 = solver.Values.Take(ac).Select(v => Math.Sqrt(Math.Max(v, 0)) / (2 * eps)).ToArray();
            for (var k = 0; k < ac; k++)
            {
                var v = (4 * a1[k] - a2[k]) / 3;
                inv += w[n] * Math.Pow(v, -d);
            }
            // sphere: states per cell = measure/(2pi)^d * solid-angle * q^(d-1) dq
            var solid = d == 3 ? 4 * Math.PI : 2 * Math.PI;
            foreach (var (q, wq) in radial)
            {
                solver.SolveValues(q * u);
                var jac = measure / Math.Pow(2 * Math.PI, d) * solid * w[n] * Math.Pow(q, d - 1) * wq;
                for (var b = 0; b < size; b++)
                {
                    var om = Math.Sqrt(Math.Max(solver.Values[b], 0));
                    for (var t = 0; t < temps.Length; t++)
                    {
                        cs[t] += jac * Cmode(om, temps[t]);
                        ss[t] += jac * Smode(om, temps[t]);
                    }
                }
            }
            solver.SolveValues(qmax * u);
            minEdge = Math.Min(minEdge, Math.Sqrt(solver.Values[0]));
        }
        var law = new double[temps.Length];
        var slaw = new double[temps.Length];
        for (var t = 0; t < temps.Length; t++)
        {
            var kt = Kb * temps[t] / Hbar;
            double c = d == 3 ? 2 * Math.PI * Math.PI / 15 * measure * kt * kt * kt * inv
                             : measure / (2 * Math.PI) * kt * kt * 7.2123414189575657 * inv; // 6 zeta(3)
            law[t] = c * R / sites;
            slaw[t] = c / (d == 3 ? 3 : 2) * R / sites;
            cs[t] *= R / sites;
            ss[t] *= R / sites;
        }
        return (law, cs, slaw, ss, Hbar * minEdge / (Kb * temps.Max()));
    }

    static double Smode(double omega, double t)
    {
        var x = Hbar * omega / (Kb * t);
        if (x > 700 || x <= 0) return 0;
        return x / (Math.Exp(x) - 1) - Math.Log(1 - Math.Exp(-x));
    }

    // Plain mesh sum on an M^d grid, own thermal sum (mid-T reference); shifted grid halves the Gamma error? use Gamma-centred.
    public static double[] MeshSum(CrystalModel model, int m, double[] temps)
    {
        var crystal = CompiledCrystal.From(model);
        var l = model.Lattice;
        var d = l.Dimension;
        var size = crystal.Size;
        var sites = model.Sites.Length;
        var cs = new double[temps.Length];
        var m3 = d == 3 ? m : 1;
        var lockObj = new object();
        Parallel.For(0, m, () => (new ModeSolver(new DynamicalMatrix(crystal)), new double[temps.Length]), (i, _, st) =>
        {
            var (solver, acc) = st;
            for (var j = 0; j < m; j++)
                for (var k = 0; k < m3; k++)
                {
                    if (i == 0 && j == 0 && k == 0) continue;
                    solver.SolveValues(l.ToCartesianQ(new Vec3((double)i / m, (double)j / m, (double)k / m3)));
                    for (var b = 0; b < size; b++)
                    {
                        var om = Math.Sqrt(Math.Max(solver.Values[b], 0));
                        for (var t = 0; t < temps.Length; t++) acc[t] += Cmode(om, temps[t]);
                    }
                }
            return st;
        }, st => { lock (lockObj) { for (var t = 0; t < temps.Length; t++) cs[t] += st.Item2[t]; } });
        var n = (double)m * m * m3;
        return cs.Select(c => c / n * R / sites).ToArray();
    }


    static double Psi(double t) => t <= 0 ? 0 : Math.Exp(-1 / t);
    // Smooth cutoff: 1 for s <= 0.5, 0 for s >= 1, C-infinity between.
    static double Window(double s)
    {
        if (s <= 0.5) return 1;
        if (s >= 1) return 0;
        var t = (s - 0.5) / 0.5;
        return 1 - Psi(t) / (Psi(t) + Psi(1 - t));
    }

    // Full-zone reference: sphere rays with the smooth window (around Gamma, where the cone is) plus a plain
    // mesh sum of the windowed-out remainder (smooth and periodic, so the mesh sum converges fast).
    public static (double[] C, double[] S) Full(CrystalModel model, int m, double[] temps)
    {
        var crystal = CompiledCrystal.From(model);
        var l = model.Lattice;
        var d = l.Dimension;
        var size = crystal.Size;
        var sites = model.Sites.Length;
        var r0 = 0.95 * Inscribed(l);
        var dirs = Directions(d, out var w);
        var gl = new GaussLegendreRule(0.5, 1.0, 10);
        var radial = new List<(double q, double wq)>();
        for (var o = 0; o < 30; o++)
        {
            var scale = r0 * Math.Pow(0.5, o);
            for (var i = 0; i < 10; i++) radial.Add((gl.Abscissas[i] * scale, gl.Weights[i] * scale));
        }
        var solid = d == 3 ? 4 * Math.PI : 2 * Math.PI;
        var c = new double[temps.Length];
        var s = new double[temps.Length];
        var lockObj = new object();
        Parallel.For(0, dirs.Count, () => (new ModeSolver(new DynamicalMatrix(crystal)), new double[2 * temps.Length]), (n, _, st) =>
        {
            var (solver, acc) = st;
            foreach (var (q, wq) in radial)
            {
                solver.SolveValues(q * dirs[n]);
                var jac = l.CellMeasure / Math.Pow(2 * Math.PI, d) * solid * w[n] * Math.Pow(q, d - 1) * wq * Window(q / r0);
                for (var b = 0; b < size; b++)
                {
                    var om = Math.Sqrt(Math.Max(solver.Values[b], 0));
                    for (var t = 0; t < temps.Length; t++) { acc[t] += jac * Cmode(om, temps[t]); acc[temps.Length + t] += jac * Smode(om, temps[t]); }
                }
            }
            return st;
        }, st => { lock (lockObj) { for (var t = 0; t < temps.Length; t++) { c[t] += st.Item2[t]; s[t] += st.Item2[temps.Length + t]; } } });
        var m3 = d == 3 ? m : 1;
        var mc = new double[temps.Length];
        var ms = new double[temps.Length];
        Parallel.For(0, m, () => (new ModeSolver(new DynamicalMatrix(crystal)), new double[2 * temps.Length]), (i, _, st) =>
        {
            var (solver, acc) = st;
            for (var j = 0; j < m; j++)
                for (var k = 0; k < m3; k++)
                {
                    // nearest image of the reduced point to Gamma, for the window
                    var best = double.MaxValue;
                    for (var a = -1; a <= 0; a++) for (var b2 = -1; b2 <= 0; b2++) for (var cc = (d == 3 ? -1 : 0); cc <= 0; cc++)
                        best = Math.Min(best, l.ToCartesianQ(new Vec3((double)i / m + a, (double)j / m + b2, (double)k / m3 + cc)).Length);
                    var wgt = 1 - Window(best / r0);
                    if (wgt == 0) continue;
                    solver.SolveValues(l.ToCartesianQ(new Vec3((double)i / m, (double)j / m, (double)k / m3)));
                    for (var b = 0; b < size; b++)
                    {
                        var om = Math.Sqrt(Math.Max(solver.Values[b], 0));
                        for (var t = 0; t < temps.Length; t++) { acc[t] += wgt * Cmode(om, temps[t]); acc[temps.Length + t] += wgt * Smode(om, temps[t]); }
                    }
                }
            return st;
        }, st => { lock (lockObj) { for (var t = 0; t < temps.Length; t++) { mc[t] += st.Item2[t]; ms[t] += st.Item2[temps.Length + t]; } } });
        var cells = (double)m * m * m3;
        return (temps.Select((_, t) => (c[t] + mc[t] / cells) * R / sites).ToArray(), temps.Select((_, t) => (s[t] + ms[t] / cells) * R / sites).ToArray());
    }

    static void Main(string[] args)
    {
        var mode = args[0];
        var cases = Cases();
        var names = args.Length > 1 ? args[1].Split(',') : cases.Keys.ToArray();
        var meshes = args.Length > 2 ? args[2].Split(',').Select(int.Parse).ToArray() : Enumerable.Range(3, 14).ToArray();
        var temps = args.Length > 3 ? args[3].Split(',').Select(double.Parse).ToArray() : [0.5, 1, 2, 5, 10, 14, 20];
        var opts = new SolveOptions { MeanSquareDisplacement = false, PartialDos = false, TemperaturesK = [.. temps] };
        foreach (var name in names)
        {
            var model = cases[name]();
            var d = model.Lattice.Dimension;
            if (mode == "print")
            {
                Console.WriteLine($"{name}: lattice {model.Lattice.Kind} a={model.Lattice.ConstantNm} A3={model.Lattice.A3M}");
                foreach (var st in model.Sites) Console.WriteLine($"  site {st}");
                foreach (var sp in model.ShellSprings) Console.WriteLine($"  spring {sp}");
                continue;
            }
            if (mode == "low")
            {
                var (law, sph, slaw, ssph, fx) = LowReference(model, temps);
                Console.WriteLine($"# {name} edgeX(at Tmax)={fx:G3}");
                for (var t = 0; t < temps.Length; t++) Console.WriteLine($"REF {name} T={temps[t]} law={law[t]:G8} sphere={sph[t]:G8} Slaw={slaw[t]:G8} Ssphere={ssph[t]:G8}");
            }
            else if (mode == "full")
            {
                foreach (var m in meshes)
                {
                    var (c, s) = Full(model, m, temps);
                    Console.WriteLine($"FULL {name} M={m} " + string.Join(" ", c.Select((x, t) => $"{temps[t]}:{x:G10}/{s[t]:G10}")));
                }
            }
            else if (mode == "minf")
            {
                var crystal = CompiledCrystal.From(model); var solver = new ModeSolver(new DynamicalMatrix(crystal)); var l = model.Lattice;
                var m = meshes[0]; var m3 = d == 3 ? m : 1; var r0 = Inscribed(l); var best = double.MaxValue; Vec3 at = Vec3.Zero; var bestOpt = double.MaxValue;
                for (var i = 0; i < m; i++) for (var j = 0; j < m; j++) for (var k = 0; k < m3; k++)
                {
                    var red = new Vec3((double)i / m, (double)j / m, (double)k / m3);
                    var near = double.MaxValue;
                    for (var a = -1; a <= 0; a++) for (var b2 = -1; b2 <= 0; b2++) for (var cc = (d == 3 ? -1 : 0); cc <= 0; cc++)
                        near = Math.Min(near, l.ToCartesianQ(new Vec3(red.X + a, red.Y + b2, red.Z + cc)).Length);
                    solver.SolveValues(l.ToCartesianQ(red));
                    var kel = Hbar * Math.Sign(solver.Values[0]) * Math.Sqrt(Math.Abs(solver.Values[0])) / Kb;
                    if (near > 0.5 * r0 && kel < best) { best = kel; at = red; }
                    if (near == 0 && crystal.Components < crystal.Size) bestOpt = Hbar * Math.Sqrt(Math.Max(solver.Values[crystal.Components], 0)) / Kb;
                }
                Console.WriteLine($"MINF {name} lowest branch-0 outside r0/2: {best:G4} K at {at}; lowest optical at Gamma {bestOpt:G4} K");
            }
            else if (mode == "fine")
            {
                foreach (var m in meshes)
                {
                    var c = MeshSum(model, m, temps);
                    Console.WriteLine($"FINE {name} M={m} " + string.Join(" ", c.Select((x, t) => $"{temps[t]}:{x:G10}")));
                }
            }
            else if (mode == "engine")
            {
                foreach (var m in meshes)
                {
                    var res = PhononSolver.Solve(model, BulkSample.Uniform(d, m), opts with { MeshCheck = args.Length > 4 });
                    if (res.Thermal.Length == 0) { Console.WriteLine($"ENG {name} M={m} unstable"); continue; }
                    Console.WriteLine($"ENG {name} M={m} fl={res.Summary.Floppy} " + string.Join(" ", res.Thermal.Select(r => $"{r.TemperatureK}:{r.HeatCapacityJPerMolK:G10}/{r.EntropyJPerMolK:G10}")));
                    if (res.MeshChange is { } mc) Console.WriteLine($"MC {name} M={m} check={string.Join("x", mc.CheckMesh)} " + string.Join(" ", mc.Thermal.Select(r => $"{r.TemperatureK}:{r.HeatCapacityJPerMolK:G4}")));
                }
            }
        }
    }
}
