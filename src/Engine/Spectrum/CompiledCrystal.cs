using System.Collections.Immutable;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Spectrum;

/// <summary>
/// A model reduced to what the dynamical matrix needs: masses in kg, every directed coupling
/// (both directions of each spring) and the self-terms. Built once per point.
/// </summary>
internal sealed record CompiledCrystal
{
    public required CrystalModel Model { get; init; }
    public required ImmutableArray<double> MassesKg { get; init; }
    public required ImmutableArray<PairCoupling> Couplings { get; init; }

    /// <summary>Self-term K_II = sum of all springs attached to site I (N/m).</summary>
    public required ImmutableArray<Matrix3> SelfTerms { get; init; }

    public int Sites => MassesKg.Length;

    public int Components => Model.ComponentsPerSite;

    public int Size => Sites * Components;

    public Lattice Lattice => Model.Lattice;

    public static CompiledCrystal From(CrystalModel model) => ForceConstantBuilder.Build(model);

    public double SiteMassKg(int i) => MassesKg[i];

    public static double KgFromAmu(double amu) => amu * PhysicalConstants.AtomicMassKg;
}
