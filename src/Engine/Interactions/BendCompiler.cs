using System.Globalization;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Interactions;

/// <summary>
/// Turns <see cref="BendSpring"/>s into linear-form terms (one per centre and pair of neighbours,
/// two for a straight or folded pair bent both ways) and those into pair blocks. The outer two atoms of a
/// bend are coupled to each other as well as to the centre, though they need not be neighbours in
/// any shell: the blocks go to whatever (site, cell) pairs the term touches.
/// </summary>
internal static class BendCompiler
{
    /// <summary>|cos theta| within this of 1 counts as a straight (or folded) pair.</summary>
    private const double StraightTolerance = 1e-9;

    /// <summary>The normal of a 2D lattice's plane, along which the flexural form bends.</summary>
    private static readonly Vec3 SheetNormal = new(0, 0, 1);

    public static void AddTo(CrystalModel model, Vec3[] positions, CouplingAccumulator blocks, List<ModelProblem> problems)
    {
        foreach (var (_, term) in Terms(model, positions, problems))
        {
            term.AddTo(blocks);
        }
    }

    /// <summary>Every linear-form term of every bend, with the index of the bend it came from.</summary>
    public static IEnumerable<(int Bend, LinearFormTerm Term)> Terms(CrystalModel model, Vec3[] positions, List<ModelProblem> problems)
    {
        var terms = new List<(int, LinearFormTerm)>();
        for (var b = 0; b < model.Bends.Length; b++)
        {
            AddBend(model, positions, b, terms, problems);
        }

        return terms;
    }

    private static void AddBend(CrystalModel model, Vec3[] positions, int index, List<(int, LinearFormTerm)> terms, List<ModelProblem> problems)
    {
        var bend = model.Bends[index];
        var sites = model.Sites;
        var where = $"bends[{index}]";
        var tolM = model.ShellToleranceNm * 1e-9;
        var lineFound = false;
        var centres = 0;
        for (var i = 0; i < sites.Length; i++)
        {
            if (sites[i].Kind != bend.CentreKind)
            {
                continue;
            }

            centres++;
            var first = Shell(model, positions, i, bend.EndKind, bend.Shell, tolM);
            var second = bend.SameEnds ? first : Shell(model, positions, i, bend.SecondKind, bend.SecondShell, tolM);
            if (first.Count == 0 || second.Count == 0 || (bend.SameEnds && first.Count < 2))
            {
                var (kind, shellNo, n) = first.Count == 0 || bend.SameEnds ? (bend.EndKind, bend.Shell, first.Count) : (bend.SecondKind, bend.SecondShell, second.Count);
                problems.Add(new(ModelProblemKind.NoNeighbourShell, where + ".shell", string.Create(CultureInfo.InvariantCulture,
                    $"site '{sites[i].Label}' has {n} neighbour(s) of kind '{kind}' in shell {shellNo}; a bend needs two ends. Pick a shell (or kinds) where each centre has two or more neighbours")));
                return;
            }

            for (var p = 0; p < first.Count; p++)
            {
                for (var q = bend.SameEnds ? p + 1 : 0; q < second.Count; q++)
                {
                    var (j, k) = (first[p], second[q]);
                    foreach (var (kappa, gj, gk) in Gradients(bend.Form, bend.ConstantNPerM, j.Separation, k.Separation, model.Lattice.Dimension))
                    {
                        lineFound |= bend.Form == BendForm.Flexural;
                        terms.Add((index, new LinearFormTerm(kappa,
                            [(i, IntVec3.Zero, -(gj + gk)), (j.Site, j.Offset, gj), (k.Site, k.Offset, gk)])));
                    }
                }
            }
        }

        if (centres > 0 && bend.Form == BendForm.Flexural && !lineFound)
        {
            problems.Add(new(ModelProblemKind.NoNeighbourShell, where + ".shell", string.Create(CultureInfo.InvariantCulture,
                $"no two ends of this bend lie on one line through a '{bend.CentreKind}' site (opposite each other, or on one ray from it), and only such a pair bends a sheet out of its plane at harmonic order. Pick ends with opposite neighbours (for a honeycomb: the other kind in shells [1, 2], the nearest neighbour and the one straight across the ring)")));
        }
    }

    /// <summary>Neighbours of site i of one kind in one shell, with their separations (m); empty when the shell does not exist.</summary>
    private static List<(int Site, IntVec3 Offset, Vec3 Separation)> Shell(CrystalModel model, Vec3[] positions, int i, string kind, int shell, double tolM)
    {
        var sites = model.Sites;
        var found = NeighbourShells.Find(model.Lattice, positions, i, j => sites[j].Kind == kind, shell, tolM) ?? [];
        return [.. found.Select(f => (f.Site, f.Offset, model.Lattice.ToCartesianM(f.Offset.AsVec3()) + positions[f.Site] - positions[i]))];
    }

    /// <summary>
    /// The gradients g_j, g_k (the centre takes -(g_j + g_k)) of each linear form of one pair with
    /// bond vectors rj, rk from the centre, and the constant each form carries.
    /// </summary>
    internal static IEnumerable<(double Kappa, Vec3 Gj, Vec3 Gk)> Gradients(BendForm form, double constant, Vec3 rj, Vec3 rk, int dimension)
    {
        var dj = rj.Length;
        var dk = rk.Length;
        var scale = Math.Sqrt(dj * dk);
        var ej = rj / dj;
        var ek = rk / dk;
        var cos = ej.Dot(ek);
        var straight = cos < -1 + StraightTolerance;
        var folded = cos > 1 - StraightTolerance;
        switch (form)
        {
            case BendForm.Keating:
                // d(rj . rk) = rk . u_j' + rj . u_k' (u' relative to the centre), divided by sqrt(dj dk).
                yield return (constant, rk / scale, rj / scale);
                break;
            case BendForm.Angle when folded:
                // Folded (both ends on one ray, e.g. shells 1 and 2 of a chain): theta^2 = |P (u_j'/dj - u_k'/dk)|^2,
                // two directions across the bonds; the general form below would divide by sin theta = 0.
                foreach (var n in Across(ej, dimension))
                {
                    yield return (constant, scale / dj * n, -scale / dk * n);
                }

                break;
            case BendForm.Angle when !straight:
                {
                    // d theta = -d cos / sin; d cos = (P_j ek) . u_j' / dj + (P_k ej) . u_k' / dk, scaled by sqrt(dj dk).
                    var sin = Math.Sqrt(Math.Max(0, 1 - cos * cos));
                    var pjEk = ek - cos * ej;
                    var pkEj = ej - cos * ek;
                    yield return (constant, -scale / (dj * sin) * pjEk, -scale / (dk * sin) * pkEj);
                    break;
                }

            case BendForm.Angle:
                // Straight: (pi - theta)^2 = |P (u_j'/dj + u_k'/dk)|^2, two directions across the bonds.
                foreach (var n in Across(ej, dimension))
                {
                    yield return (constant, scale / dj * n, scale / dk * n);
                }

                break;
            case BendForm.Flexural when straight:
                yield return (constant, scale / dj * SheetNormal, scale / dk * SheetNormal);
                break;
            case BendForm.Flexural when folded:
                // The out-of-plane part of the folded angle (the z row of the angle form's two): theta_z = z . (u_j'/dj - u_k'/dk).
                // theta^2 is smooth at theta = 0 and a sheet's z motion decouples from its in-plane motion at harmonic
                // order, so this is the z-z block of the angle energy's Hessian; a rigid tilt moves both ends alike.
                yield return (constant, scale / dj * SheetNormal, -scale / dk * SheetNormal);
                break;
        }
    }

    /// <summary>Two unit vectors across a bond along e; for a bond in a sheet, one in the plane and the normal.</summary>
    private static IEnumerable<Vec3> Across(Vec3 e, int dimension)
    {
        var z = new Vec3(0, 0, 1);
        if (dimension <= 2 && Math.Abs(e.Z) < 1e-12)
        {
            yield return z.Cross(e).Unit();
            yield return z;
            yield break;
        }

        var helper = Math.Abs(e.X) <= Math.Abs(e.Y) && Math.Abs(e.X) <= Math.Abs(e.Z) ? new Vec3(1, 0, 0)
            : Math.Abs(e.Y) <= Math.Abs(e.Z) ? new Vec3(0, 1, 0) : z;
        var n1 = (helper - helper.Dot(e) * e).Unit();
        yield return n1;
        yield return e.Cross(n1);
    }
}
