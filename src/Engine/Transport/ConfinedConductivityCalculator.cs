using System.Collections.Immutable;
using System.Numerics;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Numerics;
using LatticeSweep.Engine.QPoints;
using LatticeSweep.Engine.RealSpace;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// Kinetic theory over the confined modes of a film or wire: kappa_uu = (1/V) sum C v_u^2 tau over
/// every branch of the real-space block at every allowed wave vector of its periodic directions,
/// for in-plane (film) or axial (wire) directions u. The group velocity along u is the
/// Hellmann-Feynman derivative e^H (dD/dk_u) e / (2 omega), with dD/dk_u applied from the couplings
/// (the phase q.d of a coupling changes by sum_i (u.a_i / 2 pi)(b_i.d) per unit k_u). Inside a set of
/// degenerate modes the sum of their v_u^2 is basis-free (the squared Frobenius norm of the set's
/// velocity matrix) and is shared equally (degenerate perturbation theory; common practice, no source).
/// The scattering rates are the point's own (<see cref="ConductivityInputs"/>), so this and the
/// boundary-scattering estimate of the same point differ only in the modes.
/// </summary>
internal static class ConfinedConductivityCalculator
{
    /// <summary>Largest block (degrees of freedom) whose confined modes are summed: each wave vector costs a dense Hermitian solve.</summary>
    public const int MaxBlockSize = 1200;

    public static ConfinedConductivityResult? ComputeIfAsked(
        CrystalModel model, CompiledCrystal crystal, RealSpaceLattice lattice, SiteProperties properties, FiniteSample periodic, SolveOptions options, CancellationToken ct)
    {
        var settings = options.Conductivity;
        var periodicDirections = Enumerable.Range(0, model.Lattice.Dimension).Where(i => lattice.Treatments[i] == DirectionTreatment.Bloch && lattice.BlochCells[i] > 1).ToArray();
        if (settings is null || periodicDirections.Length == 0 || periodicDirections.Length == model.Lattice.Dimension || lattice.Size > MaxBlockSize)
        {
            return null;
        }

        var solver = new ModeSolver(new DynamicalMatrix(crystal));
        var acoustic = AcousticAverages.Measure(solver);
        var inputs = ConductivityInputs.Resolve(model, periodic, settings, acoustic);
        var temperatures = options.TemperaturesK.Contains(options.ReferenceTemperatureK)
            ? options.TemperaturesK.ToArray()
            : [.. options.TemperaturesK, options.ReferenceTemperatureK];
        var reference = Array.IndexOf(temperatures, options.ReferenceTemperatureK);
        var sum = new KineticSum(temperatures, reference, periodicDirections.Length, inputs.Rates, meanFreePaths: false);

        // Orthonormal transport directions spanning the periodic lattice vectors.
        var l = model.Lattice;
        var directions = new List<Vec3>();
        foreach (var i in periodicDirections)
        {
            var u = l.Vector(i);
            foreach (var w in directions)
            {
                u -= u.Dot(w) * w;
            }

            directions.Add(u.Unit());
        }

        var phaseDerivatives = directions.Select(u => lattice.Types.Select(t =>
            periodicDirections.Sum(i => u.Dot(l.Vector(i)) / (2 * Math.PI) * l.ReciprocalVector(i).Dot(t.SeparationM))).ToArray()).ToArray();

        var op = new RealSpaceOperator(lattice, properties);
        var n = op.Size;
        var grid = new PeriodicGrid(lattice.BlochCells[0], lattice.BlochCells[1], lattice.BlochCells[2]);
        var d = new Complex[n * n];
        var vectors = new Complex[n * n];
        var values = new double[n];
        var column = new Complex[n];
        var applied = new Complex[directions.Count][];
        var stable = true;
        var top = 0.0;
        for (var k = 0; k < applied.Length; k++)
        {
            applied[k] = new Complex[n];
        }

        foreach (var point in grid.HalfSet())
        {
            ct.ThrowIfCancellationRequested();
            var q = l.ToCartesianQ(point.Reduced);
            op.BuildComplex(q, d);
            HermitianEigenSolver.EigenSystem(d, n, values, vectors);
            top = Math.Max(top, values[^1]);
            var tolerance = 1e-6 * Math.Sqrt(Math.Max(Math.Abs(values[^1]), Math.Abs(values[0])));
            stable &= values[0] >= -1e-8 * Math.Abs(values[^1]) || point.IsGamma;
            var start = 0;
            while (start < n)
            {
                var end = start + 1;
                var omega = Math.Sqrt(Math.Max(values[start], 0));
                while (end < n && Math.Sqrt(Math.Max(values[end], 0)) - omega <= tolerance)
                {
                    end++;
                }

                AddSet(start, end);
                start = end;
            }

            void AddSet(int first, int last)
            {
                var size = last - first;
                var omega = Math.Sqrt(Math.Max(values[first], 0));
                if (omega <= 0 || omega < 1e-7 * Math.Sqrt(Math.Abs(values[^1])))
                {
                    return; // zero modes carry nothing
                }

                // Sum over the set of |e_k^H V_u e_j|^2, for each direction u.
                Span<double> frobenius = stackalloc double[3];
                frobenius.Clear();
                for (var j = first; j < last; j++)
                {
                    for (var i = 0; i < n; i++)
                    {
                        column[i] = vectors[(i * n) + j];
                    }

                    for (var u = 0; u < applied.Length; u++)
                    {
                        op.ApplyDerivative(q, phaseDerivatives[u], column, applied[u]);
                        for (var k = first; k < last; k++)
                        {
                            var element = Complex.Zero;
                            for (var i = 0; i < n; i++)
                            {
                                element += Complex.Conjugate(vectors[(i * n) + k]) * applied[u][i];
                            }

                            frobenius[u] += (element.Real * element.Real) + (element.Imaginary * element.Imaginary);
                        }
                    }
                }

                var scale = 1.0 / (size * 4 * omega * omega);
                var velocity = new Vec3(
                    Math.Sqrt(frobenius[0] * scale),
                    applied.Length > 1 ? Math.Sqrt(frobenius[1] * scale) : 0,
                    0);
                sum.Add(omega, velocity, (double)point.Weight * size);
            }
        }

        var volume = (double)lattice.AtomCount / crystal.Sites * ConductivityInputs.VolumePerCell(l, settings);
        ConductivityRow Row(int t)
        {
            double Axis(int a) => !stable || a >= directions.Count ? double.NaN : sum.Kappa(t, a) / volume;
            return new ConductivityRow(temperatures[t], Axis(0), Axis(1), double.NaN, stable ? sum.MeanKappa(t) / volume : double.NaN, double.NaN);
        }

        return new ConfinedConductivityResult
        {
            ByTemperature = [.. Enumerable.Range(0, options.TemperaturesK.Length).Select(Row)],
            AtReference = Row(reference),
            Directions = periodicDirections.Length == 1 ? $"along a{periodicDirections[0] + 1}" : $"in the a{periodicDirections[0] + 1}-a{periodicDirections[1] + 1} plane",
            SharesAtReference = stable ? sum.Shares() : ScatteringShares.Undefined,
            VolumeM3 = volume,
        };
    }
}
