using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.RealSpace;

/// <summary>
/// Bond-bending terms in a block. They reach it as pair blocks of the bulk crystal, summed with
/// everything else that couples the same pair, but a bend is a whole, and two things need it as one:
/// <list type="bullet">
/// <item>A cut. Where the sample removes a bend's centre or one of its ends, the angle no longer
/// exists and the term must vanish entirely; keeping its pair blocks between the atoms that remain
/// would leave a surface with bending it does not have (and a cut centre's two ends bent against each
/// other). Each pair of the remaining atoms gets the opposite of the term's block: the broken term
/// cancels exactly, self-terms included (the operator sums a site's self-term from the couplings it
/// keeps).</item>
/// <item>Substitutes with their own spring factor. A pair block is scaled by g_i g_j (g = sqrt f), which
/// is right for a spring but would scale a bend's three pair blocks by three different numbers and
/// break it (no longer invariant under rotations, not even positive). So a bend is scaled as a whole
/// by the geometric mean of its three atoms' factors, (f_i f_j f_k)^(1/3), as a spring is by
/// (f_i f_j)^(1/2): every intact bend gets entries of its own blocks whose weight the operator sets
/// from the site properties to make up the difference (<see cref="BendWeight"/>).</item>
/// </list>
/// Rigid translations and rotations stay free, as each bend is invariant on its own.
/// </summary>
internal static class BendsInBlock
{
    /// <summary>
    /// The extra couplings: new coupling types (numbered from <paramref name="firstType"/>, shared by
    /// every instance of the same term and ordered pair of its atoms) and, per block site, the
    /// (neighbour, type, instance) entries to add to its row; instance is -1 for a cancelling entry
    /// and otherwise indexes <c>InstanceAtoms</c> (three block sites per intact bend, present only
    /// when <paramref name="scaled"/>). Empty when the model has no bends.
    /// </summary>
    public static (PairCoupling[] Types, List<(int Neighbour, int Type, int Instance)>?[] Rows, int[] InstanceAtoms) Find(RealSpaceLattice block, int firstType, bool scaled)
    {
        var crystal = block.Crystal;
        var model = crystal.Model;
        var rows = new List<(int Neighbour, int Type, int Instance)>?[block.Sites];
        if (model.Bends.IsDefaultOrEmpty)
        {
            return ([], rows, []);
        }

        var lattice = model.Lattice;
        var positions = model.Sites.Select(s => lattice.ToCartesianM(s.Fractional)).ToArray();
        var terms = BendCompiler.Terms(model, positions, []).Select(t => t.Term).ToArray();
        var types = new List<PairCoupling>();
        var typeOf = new Dictionary<(int Term, int From, int To, bool Cancel), int>();
        var instances = new List<int>();
        var located = new int[3];

        for (var s = 0; s < block.Sites; s++)
        {
            var cell = block.CellOf[s];
            for (var t = 0; t < terms.Length; t++)
            {
                var atoms = terms[t].Atoms;
                for (var a = 0; a < atoms.Length; a++)
                {
                    if (atoms[a].Site != block.BasisOf[s])
                    {
                        continue;
                    }

                    // The instance of term t whose atom a is site s; it is handled at its first atom present.
                    var centre = cell - atoms[a].Offset;
                    var first = true;
                    var broken = false;
                    for (var b = 0; b < atoms.Length; b++)
                    {
                        located[b] = b == a ? s : block.Locate(centre + atoms[b].Offset, atoms[b].Site);
                        first &= b >= a || located[b] < 0;
                        broken |= located[b] < 0;
                    }

                    if (!first || (!broken && !scaled))
                    {
                        continue;
                    }

                    var instance = -1;
                    if (!broken)
                    {
                        instance = instances.Count / 3;
                        instances.AddRange(located);
                    }

                    for (var m = 0; m < atoms.Length; m++)
                    {
                        for (var n = 0; n < atoms.Length; n++)
                        {
                            if (m == n || located[m] < 0 || located[n] < 0)
                            {
                                continue;
                            }

                            if (!typeOf.TryGetValue((t, m, n, broken), out var type))
                            {
                                type = firstType + types.Count;
                                typeOf[(t, m, n, broken)] = type;
                                types.Add(Block(terms[t], m, n, lattice, positions, broken ? -1 : 1));
                            }

                            (rows[located[m]] ??= []).Add((located[n], type, instance));
                        }
                    }
                }
            }
        }

        return ([.. types], rows, [.. instances]);
    }

    /// <summary>
    /// The weight of an intact bend's own block on the pair (i, j) so that the pair's total share of
    /// the bend, g_i g_j (1 + weight), is the bend's scale (f_a f_b f_c)^(1/3) = (g_a g_b g_c)^(2/3).
    /// </summary>
    public static double BendWeight(ReadOnlySpan<double> springScale, ReadOnlySpan<int> instanceAtoms, int instance, int i, int j)
    {
        var product = springScale[instanceAtoms[3 * instance]] * springScale[instanceAtoms[(3 * instance) + 1]] * springScale[instanceAtoms[(3 * instance) + 2]];
        return (Math.Cbrt(product * product) / (springScale[i] * springScale[j])) - 1;
    }

    /// <summary>The block term <paramref name="term"/> gives the pair (m, n), -kappa g_m g_n^T, times <paramref name="sign"/>, with the pair's separation.</summary>
    private static PairCoupling Block(LinearFormTerm term, int m, int n, Lattice lattice, Vec3[] positions, int sign)
    {
        var (sm, om, gm) = term.Atoms[m];
        var (sn, on, gn) = term.Atoms[n];
        var separation = lattice.ToCartesianM((on - om).AsVec3()) + positions[sn] - positions[sm];
        return new PairCoupling(sm, sn, separation, Matrix3.Outer(gm, gn, -sign * term.KappaNPerM));
    }
}
