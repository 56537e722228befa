using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.RealSpace;

/// <summary>
/// Bond-bending terms reach a block as pair blocks of the bulk crystal, summed with everything else
/// that couples the same pair. A bend is a whole, though: where a cut removes its centre or one of
/// its ends, the angle no longer exists and the term must vanish entirely. Keeping the pair blocks
/// between the atoms that remain would leave a surface with bending it does not have (and a cut
/// centre's two ends coupled to each other). This finds every term instance the sample cuts and
/// gives, for each pair of its remaining atoms, the opposite of the term's block: added beside the
/// bulk couplings they cancel the broken term exactly, self-terms included (the operator sums a
/// site's self-term from the couplings it keeps), so what is left is the energy of the sample's
/// own triples. Rigid translations and rotations stay free, as each bend is invariant on its own.
/// </summary>
internal static class CutBendTerms
{
    /// <summary>
    /// The correcting couplings: new coupling types (numbered from <paramref name="firstType"/>, one per
    /// term and ordered pair of its atoms, shared by every cut instance of that term) and, per block
    /// site, the (neighbour, type) entries to add to its row. Empty when the model has no bends or
    /// the sample cuts none.
    /// </summary>
    public static (PairCoupling[] Types, List<(int Neighbour, int Type)>[] Rows) Find(RealSpaceLattice block, int firstType)
    {
        var crystal = block.Crystal;
        var model = crystal.Model;
        var rows = new List<(int Neighbour, int Type)>[block.Sites];
        if (model.Bends.IsDefaultOrEmpty)
        {
            return ([], rows);
        }

        var lattice = model.Lattice;
        var positions = model.Sites.Select(s => lattice.ToCartesianM(s.Fractional)).ToArray();
        var terms = BendCompiler.Terms(model, positions, []).Select(t => t.Term).ToArray();
        var types = new List<PairCoupling>();
        var typeOf = new Dictionary<(int Term, int From, int To), int>();
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

                    if (!first || !broken)
                    {
                        continue;
                    }

                    for (var m = 0; m < atoms.Length; m++)
                    {
                        for (var n = 0; n < atoms.Length; n++)
                        {
                            if (m == n || located[m] < 0 || located[n] < 0)
                            {
                                continue;
                            }

                            if (!typeOf.TryGetValue((t, m, n), out var type))
                            {
                                type = firstType + types.Count;
                                typeOf[(t, m, n)] = type;
                                types.Add(Cancelling(terms[t], m, n, lattice, positions));
                            }

                            (rows[located[m]] ??= []).Add((located[n], type));
                        }
                    }
                }
            }
        }

        return ([.. types], rows);
    }

    /// <summary>The opposite of the block term <paramref name="term"/> gives the pair (m, n): +kappa g_m g_n^T, with the pair's separation.</summary>
    private static PairCoupling Cancelling(LinearFormTerm term, int m, int n, Lattice lattice, Vec3[] positions)
    {
        var (sm, om, gm) = term.Atoms[m];
        var (sn, on, gn) = term.Atoms[n];
        var separation = lattice.ToCartesianM((on - om).AsVec3()) + positions[sn] - positions[sm];
        return new PairCoupling(sm, sn, separation, Matrix3.Outer(gm, gn, term.KappaNPerM));
    }
}
