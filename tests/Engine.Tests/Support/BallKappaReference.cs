using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Units;
using MathNet.Numerics.Integration;

namespace LatticeSweep.Engine.Tests.Support;

/// <summary>
/// An independent low-temperature reference for the conductivity of a 3D model: the kinetic integral
/// kappa_aa = (2 pi)^-3 int d^3q sum_b C v_b,a^2 tau (Ziman, Electrons and Phonons, ch. 8) over the ball
/// |q| &lt; R in spherical coordinates, where the integrand has died out before R (low temperature). It
/// solves the model's dynamical matrix at every node (the engine's mode solver and Hellmann-Feynman
/// velocities, nothing of its long-wave cell, window or rays), takes the directions on composite
/// Gauss-Legendre rules in cos(theta) and phi (panels of 8 nodes: the integrand has kinks where branches
/// cross) and |q| on <see cref="RadialPanels"/> panels of 6 nodes, and writes the relaxation times out
/// again from their published forms (Matthiessen's rule). The hemisphere is doubled (q and -q alike).
/// </summary>
internal static class BallKappaReference
{
    public const int RadialPanels = 96;

    /// <summary>The channels written out: each null is off. Umklapp takes its theta and v given.</summary>
    public sealed record Channels
    {
        public double? ConstantPs { get; init; }

        /// <summary>Casimir's |v| / L (Casimir, Physica 5, 495 (1938)), diffuse walls.</summary>
        public double? BoundaryLengthNm { get; init; }

        /// <summary>Rayleigh V0 Gamma omega^4 / (4 pi v^3) (Klemens, Proc. Phys. Soc. A 68, 1113 (1955)): (Gamma, v in m/s).</summary>
        public (double Gamma, double SpeedMPerS)? PointDefects { get; init; }

        /// <summary>(hbar gamma^2 / (M v^2 theta)) omega^2 T exp(-theta / 3T) (Slack and Galginaitis, Phys. Rev. 133, A253 (1964)).</summary>
        public (double Grueneisen, double ThetaK, double SpeedMPerS)? Umklapp { get; init; }
    }

    /// <summary>kappa_xx, kappa_yy, kappa_zz (W/(m K)) per temperature and the outermost radial panel's share of the trace (must be negligible).</summary>
    public static (double[][] Kappa, double[] TailShare) Compute(CrystalModel model, Channels channels, double[] temperaturesK, double radiusPerM, int cosinePanels, int azimuthPanels)
    {
        var solver = new ModeSolver(new DynamicalMatrix(CompiledCrystal.From(model)));
        var group = new GroupVelocities(solver);
        var n = solver.Size;
        var velocities = new double[n * 3];
        var meanMassKg = model.Sites.Average(s => s.MassAmu) * PhysicalConstants.AtomicMassKg;
        var volumePerAtom = model.Lattice.CellMeasure / model.Sites.Length;
        var angular = new GaussLegendreRule(0, 1, 8);
        var radial = new GaussLegendreRule(0, 1, 6);
        var kappa = temperaturesK.Select(_ => new double[3]).ToArray();
        var tail = new double[temperaturesK.Length];

        double Rate(double omega, double speed, double temperatureK)
        {
            var rate = 0.0;
            if (channels.ConstantPs is { } tau)
            {
                rate += 1 / (tau * 1e-12);
            }

            if (channels.BoundaryLengthNm is { } length)
            {
                rate += speed / (length * 1e-9);
            }

            if (channels.PointDefects is { } pd)
            {
                rate += volumePerAtom * pd.Gamma / (4 * Math.PI * Math.Pow(pd.SpeedMPerS, 3)) * Math.Pow(omega, 4);
            }

            if (channels.Umklapp is { } u)
            {
                rate += PhysicalConstants.HbarJS * u.Grueneisen * u.Grueneisen / (meanMassKg * u.SpeedMPerS * u.SpeedMPerS * u.ThetaK)
                    * omega * omega * temperatureK * Math.Exp(-u.ThetaK / (3 * temperatureK));
            }

            return rate;
        }

        for (var ci = 0; ci < cosinePanels * 8; ci++)
        {
            var cosine = ((ci / 8) + angular.Abscissas[ci % 8]) / cosinePanels;
            var cosineWeight = angular.Weights[ci % 8] / cosinePanels;
            var sine = Math.Sqrt(1 - (cosine * cosine));
            for (var pi = 0; pi < azimuthPanels * 8; pi++)
            {
                var phi = 2 * Math.PI * ((pi / 8) + angular.Abscissas[pi % 8]) / azimuthPanels;
                var phiWeight = 2 * Math.PI * angular.Weights[pi % 8] / azimuthPanels;
                var u = new Vec3(sine * Math.Cos(phi), sine * Math.Sin(phi), cosine);
                for (var p = 0; p < RadialPanels; p++)
                {
                    for (var i = 0; i < radial.Abscissas.Length; i++)
                    {
                        var rho = radiusPerM * (p + radial.Abscissas[i]) / RadialPanels;
                        var weight = 2 * cosineWeight * phiWeight * radiusPerM * radial.Weights[i] / RadialPanels * rho * rho;
                        group.Solve(rho * u, u, velocities);
                        for (var b = 0; b < n; b++)
                        {
                            var omega = Math.Sqrt(Math.Max(solver.Values[b], 0));
                            if (!(omega > 0))
                            {
                                continue;
                            }

                            var (vx, vy, vz) = (velocities[3 * b], velocities[(3 * b) + 1], velocities[(3 * b) + 2]);
                            var speed = Math.Sqrt((vx * vx) + (vy * vy) + (vz * vz));
                            for (var t = 0; t < temperaturesK.Length; t++)
                            {
                                var heat = PhysicalConstants.BoltzmannJPerK * ModeHeatCapacity.InBoltzmannUnits(omega, temperaturesK[t]);
                                if (!(heat > 0))
                                {
                                    continue;
                                }

                                var f = weight * heat / Rate(omega, speed, temperaturesK[t]);
                                kappa[t][0] += f * vx * vx;
                                kappa[t][1] += f * vy * vy;
                                kappa[t][2] += f * vz * vz;
                                if (p == RadialPanels - 1)
                                {
                                    tail[t] += f * speed * speed;
                                }
                            }
                        }
                    }
                }
            }
        }

        var scale = 1 / Math.Pow(2 * Math.PI, 3);
        for (var t = 0; t < temperaturesK.Length; t++)
        {
            var trace = kappa[t].Sum();
            tail[t] /= trace;
            for (var a = 0; a < 3; a++)
            {
                kappa[t][a] *= scale;
            }
        }

        return (kappa, tail);
    }
}
