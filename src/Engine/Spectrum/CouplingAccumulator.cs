using System.Collections.Immutable;
using System.Globalization;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// Collects force-constant blocks between pairs of atoms (site I in the home cell, site J in the
/// cell at an offset) and turns them into directed couplings. A block K is the spring seen from I
/// towards J: the force constant Phi(I, J+R) = -K. Pair springs give symmetric blocks; many-body
/// terms (bond bending) give blocks that need not be symmetric, so the reverse direction always
/// carries K^T. Every block also enters both self-terms (K on I, K^T on J), which makes the
/// acoustic sum rule hold by construction whatever the source of the block.
/// </summary>
internal sealed class CouplingAccumulator
{
    private readonly Dictionary<BondKey, Matrix3> _blocks = [];

    public int Count => _blocks.Count;

    /// <summary>Adds the block seen from site <paramref name="i"/> (home cell) towards site <paramref name="j"/> in the cell at <paramref name="offset"/>.</summary>
    public void Add(int i, int j, IntVec3 offset, Matrix3 blockFromI)
    {
        var (key, swapped) = Canonical(i, j, offset);
        var block = swapped ? blockFromI.Transpose() : blockFromI;
        _blocks[key] = _blocks.TryGetValue(key, out var existing) ? existing + block : block;
    }

    /// <summary>The identity of an undirected pair, the same from either end (to count a pair found from both ends once).</summary>
    public static BondKey KeyOf(int i, int j, IntVec3 offset) => Canonical(i, j, offset).Key;

    /// <summary>Both directions of every block and the self-terms; separations from the site positions (m).</summary>
    public (ImmutableArray<PairCoupling> Couplings, Matrix3[] SelfTerms) Compile(Lattice lattice, Vec3[] positions)
    {
        var couplings = ImmutableArray.CreateBuilder<PairCoupling>(_blocks.Count * 2);
        var selfTerms = new Matrix3[positions.Length];
        foreach (var (key, k) in _blocks)
        {
            var d = lattice.ToCartesianM(key.Offset.AsVec3()) + positions[key.J] - positions[key.I];
            var kt = k.Transpose();
            couplings.Add(new PairCoupling(key.I, key.J, d, k));
            couplings.Add(new PairCoupling(key.J, key.I, -d, kt));
            selfTerms[key.I] += k;
            selfTerms[key.J] += kt;
        }

        return (couplings.ToImmutable(), selfTerms);
    }

    /// <summary>The same undirected pair seen from either end maps to one key; <c>swapped</c> says the block must be transposed.</summary>
    private static (BondKey Key, bool Swapped) Canonical(int i, int j, IntVec3 offset)
    {
        if (i < j)
        {
            return (new BondKey(i, j, offset), false);
        }

        if (j < i)
        {
            return (new BondKey(j, i, -offset), true);
        }

        var positive = offset.N1 > 0 || (offset.N1 == 0 && (offset.N2 > 0 || (offset.N2 == 0 && offset.N3 > 0)));
        return positive ? (new BondKey(i, i, offset), false) : (new BondKey(i, i, -offset), true);
    }

    internal readonly record struct BondKey(int I, int J, IntVec3 Offset)
    {
        public override string ToString() => string.Create(CultureInfo.InvariantCulture, $"{I}->{J}@{Offset}");
    }
}
