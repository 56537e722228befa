using LatticeSweep.Engine.Errors;

namespace LatticeSweep.Engine.Samples;

/// <summary>
/// The bulk (infinite crystal) limit sampled on a Gamma-centred mesh of M1 x M2 x M3 wave vectors,
/// integrated with the linear tetrahedron method (3D) or its triangle (2D) and interval (1D)
/// analogues. Unused directions of a 1D or 2D lattice have M = 1.
/// </summary>
public sealed record BulkSample : Sample
{
    private BulkSample(int m1, int m2, int m3)
    {
        M1 = m1;
        M2 = m2;
        M3 = m3;
    }

    public int M1 { get; }
    public int M2 { get; }
    public int M3 { get; }

    public long PointCount => (long)M1 * M2 * M3;

    public int this[int axis] => axis switch { 0 => M1, 1 => M2, 2 => M3, _ => throw new ArgumentOutOfRangeException(nameof(axis)) };

    public static BulkSample Create(int m1, int m2 = 1, int m3 = 1)
    {
        var problems = new List<ModelProblem>();
        foreach (var (m, key) in new[] { (m1, "sample.mesh[0]"), (m2, "sample.mesh[1]"), (m3, "sample.mesh[2]") })
        {
            if (m < 1)
            {
                problems.Add(new(ModelProblemKind.OutOfRange, key, $"mesh points per direction must be >= 1, got {m}"));
            }
        }

        if (problems.Count > 0)
        {
            throw new ModelException(problems);
        }

        return new BulkSample(m1, m2, m3);
    }

    /// <summary>A mesh of the same count along each of the lattice's directions.</summary>
    public static BulkSample Uniform(int dimension, int perDirection) =>
        Create(perDirection, dimension >= 2 ? perDirection : 1, dimension >= 3 ? perDirection : 1);
}
