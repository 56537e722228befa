using System.Collections.Concurrent;
using System.Globalization;
using System.Text;
using LatticeSweep.Engine.Numerics;

namespace LatticeSweep.Engine.Thermal;

/// <summary>
/// The lattice zeta values a mesh's q = 0 point needs (<see cref="GammaCellSums"/>): Z(-1), Z'(0), Z(-3) of the mesh's step
/// lattice and, per real harmonic of <see cref="GammaCellSums"/>'s list, its four Hecke sums. They depend on the lattice and the
/// mesh counts only, never on masses or springs, and cost about a hundred Ewald sums (90 harmonics in 3D), more than the
/// rest of a small bulk point: a sweep over a model's numbers on one lattice and mesh computes them once (the bench's 20 ms
/// points took 2.4 times as long without the cache; bench/README.md, Round 30 (lead)).
/// </summary>
/// <param name="AtMinusOne">Z(-1).</param>
/// <param name="SlopeAtZero">Z'(0).</param>
/// <param name="AtMinusThree">Z(-3).</param>
/// <param name="Harmonic">Per harmonic, in the list's order, Z_P at s = (l - 1) / 2, l / 2, (l - 3) / 2 and max(1, (l - 2) / 2).</param>
internal sealed record MeshZetaValues(double AtMinusOne, double SlopeAtZero, double AtMinusThree, IReadOnlyList<double[]> Harmonic)
{
    /// <summary>Beyond this many lattices and meshes in one process the cache starts again (a sweep over the lattice constant).</summary>
    private const int MaxEntries = 256;

    private static readonly ConcurrentDictionary<string, MeshZetaValues> Cache = new();

    /// <summary>The values for the step lattice with basis rows <paramref name="basis"/> (Cartesian, d x d) and its Gram matrix.</summary>
    public static MeshZetaValues For(double[,] basis, double[,] gram, IReadOnlyList<(int Degree, Func<double[], double> Harmonic)> harmonics)
    {
        var key = Key(basis);
        if (Cache.TryGetValue(key, out var known))
        {
            return known;
        }

        var (atMinusOne, slopeAtZero) = LatticeZeta.Of(gram);
        var sums = new List<double[]>(harmonics.Count);
        foreach (var (degree, harmonic) in harmonics)
        {
            double Polynomial(double[] x)
            {
                var r = Math.Sqrt(x.Sum(c => c * c));
                return Math.Pow(r, degree) * harmonic([.. x.Select(c => c / r)]);
            }

            sums.Add(LatticeZeta.HarmonicSum(basis, Polynomial, degree, (degree - 1) / 2.0, degree / 2.0, (degree - 3) / 2.0, Math.Max(1, (degree - 2) / 2.0)));
        }

        var values = new MeshZetaValues(atMinusOne, slopeAtZero, LatticeZeta.AtMinusThree(gram), sums);
        if (Cache.Count >= MaxEntries)
        {
            Cache.Clear();
        }

        Cache[key] = values;
        return values;
    }

    /// <summary>The basis's entries, exactly (round-trip digits): equal keys, equal lattices.</summary>
    private static string Key(double[,] basis)
    {
        var text = new StringBuilder();
        foreach (var x in basis)
        {
            text.Append(x.ToString("R", CultureInfo.InvariantCulture)).Append(';');
        }

        return text.ToString();
    }
}
