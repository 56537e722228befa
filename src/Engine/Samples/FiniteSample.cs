using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Samples;

/// <summary>
/// A finite crystal of N1 x N2 x N3 cells with periodic (Born-von Karman) boundaries. Its allowed
/// wave vectors are exactly q = sum n_i b_i / N_i with n_i in [-N_i/2, N_i/2). Unused directions of
/// a 1D or 2D lattice have N = 1.
/// </summary>
public sealed record FiniteSample : Sample
{
    private FiniteSample(int n1, int n2, int n3)
    {
        N1 = n1;
        N2 = n2;
        N3 = n3;
    }

    public int N1 { get; }
    public int N2 { get; }
    public int N3 { get; }

    public long CellCount => (long)N1 * N2 * N3;

    public int this[int axis] => axis switch { 0 => N1, 1 => N2, 2 => N3, _ => throw new ArgumentOutOfRangeException(nameof(axis)) };

    public static FiniteSample Create(int n1, int n2 = 1, int n3 = 1)
    {
        var problems = new List<ModelProblem>();
        foreach (var (n, key) in new[] { (n1, "sample.cells[0]"), (n2, "sample.cells[1]"), (n3, "sample.cells[2]") })
        {
            if (n < 1)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, key, $"cells per direction must be >= 1, got {n}"));
            }
        }

        if (problems.Count > 0)
        {
            throw new ModelException(problems);
        }

        return new FiniteSample(n1, n2, n3);
    }

    /// <summary>Checks the cell counts against the lattice's dimension (unused directions must be 1).</summary>
    public void CheckAgainst(Lattice lattice)
    {
        ArgumentNullException.ThrowIfNull(lattice);
        if ((lattice.Dimension < 3 && N3 != 1) || (lattice.Dimension < 2 && N2 != 1))
        {
            throw Guard.Single(ModelProblemKind.DimensionMismatch, "sample.cells",
                $"a {lattice.Dimension}D lattice takes {lattice.Dimension} cell count(s); the others must be 1, got [{N1}, {N2}, {N3}]");
        }
    }

    /// <summary>
    /// Cells from a sample length along each lattice vector: N_i = max(1, round(L_i / |a_i|)),
    /// rounding half away from zero. The length the crystal really has is N_i |a_i|.
    /// </summary>
    public static FiniteSample FromLengthNm(Lattice lattice, IReadOnlyList<double> lengthsNm)
    {
        ArgumentNullException.ThrowIfNull(lattice);
        ArgumentNullException.ThrowIfNull(lengthsNm);
        if (lengthsNm.Count != lattice.Dimension)
        {
            throw Guard.Single(ModelProblemKind.DimensionMismatch, "sample.length_nm",
                $"a {lattice.Dimension}D lattice needs {lattice.Dimension} length(s), got {lengthsNm.Count}");
        }

        var n = new int[3] { 1, 1, 1 };
        for (var i = 0; i < lengthsNm.Count; i++)
        {
            Guard.PositiveFinite(lengthsNm[i], $"sample.length_nm[{i}]", "the sample length");
            var cells = Math.Round(lengthsNm[i] * 1e-9 / lattice.Vector(i).Length, MidpointRounding.AwayFromZero);
            if (cells > int.MaxValue)
            {
                throw Guard.Single(ModelProblemKind.TooLarge, $"sample.length_nm[{i}]", $"{Guard.Show(lengthsNm[i])} nm is more than {int.MaxValue} cells");
            }

            n[i] = Math.Max(1, (int)cells);
        }

        return Create(n[0], n[1], n[2]);
    }
}
