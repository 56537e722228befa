using LatticeSweep.Engine.Dos;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.RealSpace;

namespace LatticeSweep.Engine.Solving;

/// <summary>
/// Chebyshev moments of one block by the kernel polynomial method, per random vector and per group
/// of degrees of freedom, and the densities they give. Groups (traces restricted and weighted):
/// 0 = all; then each basis site; then each layer; then (basis site, direction) and (layer,
/// direction) weighted by 1/(m N_group), whose densities integrated against hbar coth / (2 omega)
/// are the groups' mean-square displacements. Moments are over the non-rigid modes only (the
/// random vectors are projected off the rigid-body modes).
/// </summary>
internal sealed class KpmSpectrum
{
    public KpmSpectrum(RealSpaceLattice lattice, int moments, int vectors, double scale, double centre, double[] perVector)
    {
        Lattice = lattice;
        Moments = moments;
        Vectors = vectors;
        Scale = scale;
        Centre = centre;
        PerVector = perVector;
        var r = lattice.Crystal.Sites;
        var l = lattice.LayerCount;
        var c = lattice.Components;
        Groups = 1 + r + l + ((r + l) * c);
        Mean = new double[Groups * moments];
        for (var v = 0; v < vectors; v++)
        {
            for (var i = 0; i < Mean.Length; i++)
            {
                Mean[i] += perVector[(v * Mean.Length) + i] / vectors;
            }
        }

        Kernel = KernelPolynomialDensity.JacksonKernel(moments);
    }

    public RealSpaceLattice Lattice { get; }

    public int Moments { get; }

    public int Vectors { get; }

    /// <summary>lambda = Scale x + Centre maps x in [-1, 1] to eigenvalues (rad^2/s^2).</summary>
    public double Scale { get; }

    public double Centre { get; }

    public int Groups { get; }

    /// <summary>[vector][group][n].</summary>
    public double[] PerVector { get; }

    /// <summary>[group][n], the mean over vectors.</summary>
    public double[] Mean { get; }

    public double[] Kernel { get; }

    public int BasisGroup(int basis) => 1 + basis;

    public int LayerGroup(int layer) => 1 + Lattice.Crystal.Sites + layer;

    public int DisplacementGroup(int channel) => 1 + Lattice.Crystal.Sites + Lattice.LayerCount + channel;

    /// <summary>Frequency resolution of the Jackson kernel at omega = 0 (THz): sqrt(pi a / N).</summary>
    public double ResolutionThz => Spectrum.ModeSolver.SignedThz(Math.PI * Scale / Moments);

    /// <summary>x of an eigenvalue.</summary>
    public double XOf(double lambda) => (lambda - Centre) / Scale;

    /// <summary>
    /// Weight of each moment set between consecutive frequency edges (THz, ascending): result[bin * sets + s].
    /// The lowest bin also takes everything below its lower edge.
    /// </summary>
    public double[] Between(ReadOnlySpan<double> edgesThz, ReadOnlySpan<double> moments, int sets)
    {
        var x = new double[edgesThz.Length];
        for (var e = 0; e < x.Length; e++)
        {
            var omega = 2 * Math.PI * 1e12 * edgesThz[e];
            x[e] = e == 0 ? -1.0 : XOf(Math.Sign(omega) * omega * omega);
        }

        var above = KernelPolynomialDensity.WeightAbove(x, moments, sets, Moments, Kernel);
        var bins = edgesThz.Length - 1;
        var result = new double[bins * sets];
        for (var b = 0; b < bins; b++)
        {
            for (var s = 0; s < sets; s++)
            {
                result[(b * sets) + s] = above[(b * sets) + s] - above[((b + 1) * sets) + s];
            }
        }

        return result;
    }

    /// <summary>Edges of a frequency grid.</summary>
    public static double[] Edges(FrequencyGrid grid)
    {
        var edges = new double[grid.Bins + 1];
        for (var k = 0; k <= grid.Bins; k++)
        {
            edges[k] = grid.Edge(k);
        }

        return edges;
    }
}
