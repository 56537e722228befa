using System.Collections.Immutable;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Solving;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>Frequencies and group velocities along a polyline in reciprocal space.</summary>
internal static class DispersionCalculator
{
    public static ImmutableArray<DispersionRow> Compute(ModeSolver solver, DispersionPath path, CancellationToken ct)
    {
        var lattice = solver.Matrix.Crystal.Lattice;
        var n = solver.Size;
        var velocities = new double[n * 3];
        var group = new GroupVelocities(solver);
        var rows = ImmutableArray.CreateBuilder<DispersionRow>();
        var position = 0.0;
        var index = 0;
        for (var s = 0; s + 1 < path.Corners.Length; s++)
        {
            var from = lattice.ToCartesianQ(path.Corners[s].Reduced);
            var to = lattice.ToCartesianQ(path.Corners[s + 1].Reduced);
            var step = to - from;
            var last = s + 2 == path.Corners.Length;
            var count = path.PointsPerSegment + (last ? 1 : 0);
            for (var p = 0; p < count; p++)
            {
                ct.ThrowIfCancellationRequested();
                var t = (double)p / path.PointsPerSegment;
                var q = from + t * step;
                group.Solve(q, step, velocities);
                var rigid = IsReciprocalLatticeVector(lattice, q) ? solver.Matrix.Crystal.Components : 0;
                string? label = p == 0 ? path.Corners[s].Label : (last && p == count - 1 ? path.Corners[s + 1].Label : null);
                var here = position + t * step.Length * 1e-9;
                for (var k = 0; k < n; k++)
                {
                    // The rigid translations at q = 0 (or any reciprocal lattice vector, where D(q) has the
                    // same eigenvalues) are exactly 0 by the acoustic sum rule; the eigen-solver leaves
                    // +-1e-8 THz of round-off, and their velocity depends on the direction of approach.
                    rows.Add(k < rigid
                        ? new DispersionRow(index, here, label, q.X * 1e-9, q.Y * 1e-9, q.Z * 1e-9, k, 0.0, 0.0, 0.0, 0.0)
                        : new DispersionRow(index, here, label, q.X * 1e-9, q.Y * 1e-9, q.Z * 1e-9, k,
                            ModeSolver.SignedThz(solver.Values[k]), velocities[k * 3], velocities[k * 3 + 1], velocities[k * 3 + 2]));
                }

                index++;
            }

            position += step.Length * 1e-9;
        }

        return rows.ToImmutable();
    }

    /// <summary>True when q (1/m) is a reciprocal lattice vector: q . a_i / 2 pi is an integer for every used a_i.</summary>
    internal static bool IsReciprocalLatticeVector(Lattice lattice, Vec3 qPerM)
    {
        for (var i = 0; i < lattice.Dimension; i++)
        {
            var n = qPerM.Dot(lattice.Vector(i)) / (2 * Math.PI);
            if (Math.Abs(n - Math.Round(n)) > 1e-9)
            {
                return false;
            }
        }

        return true;
    }
}
