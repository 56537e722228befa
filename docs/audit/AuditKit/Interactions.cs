namespace LatticeSweep.Audit;

/// <summary>A three-body bend (README `[[model.bends]]`): centre kind, one or two end kinds, one or two shells, form, k in N/m.</summary>
internal sealed record AuditBend(string Centre, string[] Ends, int[] Shells, string Form, double ConstantNPerM);

/// <summary>A pair potential (README `[[model.potentials]]`), lengths in nm, energies in eV; unused parameters 0.</summary>
internal sealed record AuditPotential(
    string From, string To, string Form, double WellDepthEv, double SigmaNm, double R0Nm, double WidthPerNm,
    double RepulsionEv, double RhoNm, double DispersionEvNm6, double CutoffNm, bool Shift)
{
    /// <summary>phi(r), phi'(r), phi''(r) in eV, eV/nm, eV/nm^2, unshifted (the README's formulas, differentiated by hand).</summary>
    public (double Phi, double D1, double D2) At(double r)
    {
        switch (Form)
        {
            case "lennard_jones":
            {
                var s6 = Math.Pow(SigmaNm / r, 6);
                var s12 = s6 * s6;
                return (4 * WellDepthEv * (s12 - s6), 4 * WellDepthEv * (-12 * s12 + 6 * s6) / r, 4 * WellDepthEv * (156 * s12 - 42 * s6) / (r * r));
            }

            case "morse":
            {
                var y = Math.Exp(-WidthPerNm * (r - R0Nm));
                var a = WidthPerNm;
                return (WellDepthEv * (y * y - 2 * y), 2 * a * WellDepthEv * y * (1 - y), 2 * a * a * WellDepthEv * y * (2 * y - 1));
            }

            default:
            {
                var e = RepulsionEv * Math.Exp(-r / RhoNm);
                var c = DispersionEvNm6 / Math.Pow(r, 6);
                return (e - c, -e / RhoNm + 6 * c / r, e / (RhoNm * RhoNm) - 42 * c / (r * r));
            }
        }
    }

    /// <summary>The energy the engine sums: phi minus phi(cutoff) when shifted.</summary>
    public double Energy(double r) => At(r).Phi - (Shift ? At(CutoffNm).Phi : 0);

    public bool Joins(string a, string b) => (a == From && b == To) || (a == To && b == From);
}

/// <summary>One part of a rank-one energy term: the site, its cell relative to the anchor, and its gradient g (dimensionless).</summary>
internal sealed record TermPart(int Site, int[] Cell, double[] G);

/// <summary>
/// E = (1/2) K (sum_a g_a . u_a)^2 over a few atoms: its force constants are K g_a g_b^T for every pair (a, b), the
/// general form a bend compiles to (the gradients sum to zero, so a rigid translation costs nothing).
/// </summary>
internal sealed record RankOneTerm(double K, TermPart[] Parts);

/// <summary>
/// The interactions of a model in the audit's own terms: potentials become pair springs phi'' along and phi'/r across
/// each pair within the cutoff (README "Potentials and pre-stress": the exact second derivatives at the geometry),
/// bends become rank-one terms from the first-order change of the bend's scalar product or angle (Keating,
/// Phys. Rev. 145, 637 (1966) for the form; the linearisation is the kit's own, common practice).
/// </summary>
internal static class Interactions
{
    /// <summary>N/m per eV/nm^2.</summary>
    public const double NPerMPerEvPerNm2 = 1.602176634e-19 / 1e-18;

    private const int Reach = 4;

    /// <summary>Every site of the crystal near site `from` (cell 0): (site, cell, Cartesian offset in nm, distance), nearest first.</summary>
    public static List<(int Site, int[] Cell, double[] D, double R)> Around(AuditModel m, int from, int reach = Reach)
    {
        var list = new List<(int, int[], double[], double)>();
        var d = m.Dimension;
        var ri = m.Cartesian(m.Sites[from].Fraction);
        for (var j = 0; j < m.Sites.Length; j++)
        {
            var rj = m.Cartesian(m.Sites[j].Fraction);
            for (var x = -reach; x <= reach; x++)
            {
                for (var y = d > 1 ? -reach : 0; y <= (d > 1 ? reach : 0); y++)
                {
                    for (var z = d > 2 ? -reach : 0; z <= (d > 2 ? reach : 0); z++)
                    {
                        if (j == from && x == 0 && y == 0 && z == 0)
                        {
                            continue;
                        }

                        var c = m.Cartesian([x, y, z]);
                        var v = new[] { rj[0] + c[0] - ri[0], rj[1] + c[1] - ri[1], rj[2] + c[2] - ri[2] };
                        list.Add((j, [x, y, z], v, Math.Sqrt(v[0] * v[0] + v[1] * v[1] + v[2] * v[2])));
                    }
                }
            }
        }

        list.Sort((p, q) => p.Item4.CompareTo(q.Item4));
        return list;
    }

    /// <summary>The members of distance shell `shell` (1 = nearest) of sites of kind `kind` around site `from` (shells 1e-5 nm apart, the README's default tolerance).</summary>
    public static List<(int Site, int[] Cell, double[] D, double R)> Shell(AuditModel m, int from, string kind, int shell)
    {
        var all = Around(m, from).Where(n => m.Sites[n.Site].Label == kind).ToList();
        var distinct = new List<double>();
        foreach (var n in all)
        {
            if (distinct.Count == 0 || n.R - distinct[^1] > 1e-5)
            {
                distinct.Add(n.R);
            }
        }

        if (shell > distinct.Count)
        {
            return [];
        }

        var radius = distinct[shell - 1];
        return [.. all.Where(n => Math.Abs(n.R - radius) <= 1e-5)];
    }

    /// <summary>Pair springs of the potentials: each pair (site i in cell 0, site j in cell R) within the cutoff once.</summary>
    public static List<AuditBond> PotentialBonds(AuditModel m)
    {
        var bonds = new List<AuditBond>();
        foreach (var p in m.PotentialList)
        {
            var seen = new HashSet<string>();
            for (var i = 0; i < m.Sites.Length; i++)
            {
                foreach (var n in Around(m, i))
                {
                    if (n.R >= p.CutoffNm || !p.Joins(m.Sites[i].Label, m.Sites[n.Site].Label))
                    {
                        continue;
                    }

                    var key = $"{i}:{n.Site}:{string.Join(",", n.Cell)}";
                    var reverse = $"{n.Site}:{i}:{string.Join(",", n.Cell.Select(v => -v))}";
                    if (seen.Contains(reverse) || !seen.Add(key))
                    {
                        continue;
                    }

                    var (_, d1, d2) = p.At(n.R);
                    bonds.Add(new AuditBond(i, n.Site, [.. n.Cell.Take(m.Dimension)], d2 * NPerMPerEvPerNm2, d1 / n.R * NPerMPerEvPerNm2));
                }
            }
        }

        return bonds;
    }

    /// <summary>Static energy per atom (eV) and the static pressure -dE/dV (GPa, 3D) of the potentials at the given geometry.</summary>
    public static (double EnergyEvPerAtom, double PressureGpa) Static(AuditModel m)
    {
        double e = 0, virial = 0;
        foreach (var p in m.PotentialList)
        {
            for (var i = 0; i < m.Sites.Length; i++)
            {
                foreach (var n in Around(m, i))
                {
                    if (n.R < p.CutoffNm && p.Joins(m.Sites[i].Label, m.Sites[n.Site].Label))
                    {
                        // every ordered pair from the cell's sites counts half its energy
                        e += 0.5 * p.Energy(n.R);
                        virial += 0.5 * p.At(n.R).D1 * n.R;
                    }
                }
            }
        }

        // E(s) over isotropic scaling r -> s r: dE/ds = sum phi' r, dV/ds = d V at s = 1; 1 eV/nm^3 = 0.1602176634 GPa
        var pressure = -virial / (m.Dimension * m.CellMeasureNm()) * 0.1602176634;
        return (e / m.Sites.Length, pressure);
    }

    /// <summary>Every bend of the model as rank-one terms anchored at a centre site in cell 0.</summary>
    public static List<RankOneTerm> BendTerms(AuditModel m)
    {
        var terms = new List<RankOneTerm>();
        foreach (var b in m.BendList)
        {
            for (var c = 0; c < m.Sites.Length; c++)
            {
                if (m.Sites[c].Label != b.Centre)
                {
                    continue;
                }

                var endA = b.Ends[0];
                var endB = b.Ends.Length > 1 ? b.Ends[1] : b.Ends[0];
                var shellA = b.Shells[0];
                var shellB = b.Shells.Length > 1 ? b.Shells[1] : b.Shells[0];
                var setA = Shell(m, c, endA, shellA);
                var same = endA == endB && shellA == shellB;
                var setB = same ? setA : Shell(m, c, endB, shellB);
                for (var x = 0; x < setA.Count; x++)
                {
                    for (var y = same ? x + 1 : 0; y < setB.Count; y++)
                    {
                        var j = setA[x];
                        var k = setB[y];
                        if (j.Site == k.Site && j.Cell.SequenceEqual(k.Cell))
                        {
                            continue;
                        }

                        terms.AddRange(Bend(b, c, j, k));
                    }
                }
            }
        }

        return terms;
    }

    private static IEnumerable<RankOneTerm> Bend(AuditBend b, int centre, (int Site, int[] Cell, double[] D, double R) j, (int Site, int[] Cell, double[] D, double R) k)
    {
        var rij = j.D;
        var rik = k.D;
        var dij = j.R;
        var dik = k.R;
        var scale = Math.Sqrt(dij * dik);
        int[] zero = [0, 0, 0];
        if (b.Form == "keating")
        {
            // d(r_ij . r_ik) = r_ik . (u_j - u_i) + r_ij . (u_k - u_i); E = (1/2) k [.]^2 / (d_ij d_ik)
            var gj = rik.Select(v => v / scale).ToArray();
            var gk = rij.Select(v => v / scale).ToArray();
            yield return Term(b.ConstantNPerM, centre, j, k, gj, gk, zero);
            yield break;
        }

        var ej = rij.Select(v => v / dij).ToArray();
        var ek = rik.Select(v => v / dik).ToArray();
        var cos = Dot(ej, ek);
        if (cos < -1 + 1e-9)
        {
            // a straight pair: theta = pi - |w|, w = P_perp [(u_j - u_i) / d_ij + (u_k - u_i) / d_ik], two directions
            foreach (var p in Perpendiculars(ej))
            {
                if (b.Form == "flexural" && Math.Abs(p[2]) < 0.5)
                {
                    continue; // the in-plane direction of a sheet's bend is not flexural (README: the part that moves atoms out of the sheet)
                }

                var gj = p.Select(v => v * scale / dij).ToArray();
                var gk = p.Select(v => v * scale / dik).ToArray();
                yield return Term(b.ConstantNPerM, centre, j, k, gj, gk, zero);
            }

            yield break;
        }

        if (cos > 1 - 1e-9 && b.Form is ("angle" or "flexural"))
        {
            // a folded pair (both ends on one ray, a chain's shells 1 and 2): theta = |P_perp [(u_j - u_i) / d_ij - (u_k - u_i) / d_ik]|;
            // `flexural` keeps the out-of-plane direction alone (README: the tilt of one end against the other)
            foreach (var p in Perpendiculars(ej))
            {
                if (b.Form == "flexural" && Math.Abs(p[2]) < 0.5)
                {
                    continue;
                }

                var gj = p.Select(v => v * scale / dij).ToArray();
                var gk = p.Select(v => -v * scale / dik).ToArray();
                yield return Term(b.ConstantNPerM, centre, j, k, gj, gk, zero);
            }

            yield break;
        }

        if (b.Form == "flexural")
        {
            yield break; // a bent pair in the sheet's plane moves no atom out of it at harmonic order
        }

        // d theta = -d cos / sin theta; d cos = (e_k - cos e_j).(u_j - u_i) / d_ij + (e_j - cos e_k).(u_k - u_i) / d_ik
        var sin = Math.Sqrt(1 - cos * cos);
        var aj = Enumerable.Range(0, 3).Select(a => -(ek[a] - cos * ej[a]) / (dij * sin) * scale).ToArray();
        var ak = Enumerable.Range(0, 3).Select(a => -(ej[a] - cos * ek[a]) / (dik * sin) * scale).ToArray();
        yield return Term(b.ConstantNPerM, centre, j, k, aj, ak, zero);
    }

    private static RankOneTerm Term(double k, int centre, (int Site, int[] Cell, double[] D, double R) j, (int Site, int[] Cell, double[] D, double R) kk,
        double[] gj, double[] gk, int[] zero)
    {
        var gi = Enumerable.Range(0, 3).Select(a => -(gj[a] + gk[a])).ToArray();
        return new RankOneTerm(k, [new TermPart(centre, zero, gi), new TermPart(j.Site, j.Cell, gj), new TermPart(kk.Site, kk.Cell, gk)]);
    }

    /// <summary>Two unit vectors perpendicular to e and to each other; for a bond in the xy plane the second is z.</summary>
    private static double[][] Perpendiculars(double[] e)
    {
        double[] z = [0, 0, 1];
        double[] first = Math.Abs(e[2]) < 0.9 ? Cross(z, e) : Cross([1, 0, 0], e);
        var n = Math.Sqrt(Dot(first, first));
        first = [.. first.Select(v => v / n)];
        var second = Cross(e, first);
        return [first, second];
    }

    private static double Dot(double[] a, double[] b) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];

    private static double[] Cross(double[] a, double[] b) =>
        [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}
