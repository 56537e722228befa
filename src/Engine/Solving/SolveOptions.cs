using System.Collections.Immutable;
using LatticeSweep.Engine.QuasiHarmonic;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Engine.Solving;

/// <summary>What to compute for one model besides the summary.</summary>
public sealed record SolveOptions
{
    /// <summary>Temperatures (K) of the thermal table; each must be >= 0.</summary>
    public ImmutableArray<double> TemperaturesK { get; init; } = [10, 50, 100, 200, 300, 500, 1000];

    /// <summary>Temperature (K) of the summary's thermal numbers.</summary>
    public double ReferenceTemperatureK { get; init; } = 300.0;

    /// <summary>Number of DOS bins from 0 to just above the highest frequency.</summary>
    public int DosBins { get; init; } = 200;

    public DosMethod DosMethod { get; init; } = DosMethod.Auto;

    /// <summary>Gaussian standard deviation (THz) when <see cref="DosMethod"/> is Gaussian.</summary>
    public double GaussianSigmaThz { get; init; } = 0.05;

    /// <summary>Per-site (partial) densities of states from eigenvector weights.</summary>
    public bool PartialDos { get; init; } = true;

    /// <summary>Mean-square displacement per site and direction at each temperature.</summary>
    public bool MeanSquareDisplacement { get; init; } = true;

    /// <summary>Optional dispersion path with group velocities.</summary>
    public DispersionPath? Dispersion { get; init; }

    /// <summary>Exact list of distinct frequencies of a finite crystal, when it has at most this many modes (0 = never).</summary>
    public long ModeListMaxModes { get; init; } = 20_000;

    /// <summary>
    /// Bulk meshes: solve the thermal sums again on the half-density mesh and report how much each
    /// number changes (<see cref="Results.PointResult.MeshChange"/>). Off by default: the check mesh's
    /// own long-wave rays and thermal sums make it cost 10 to 70 % of the point (bench/README.md,
    /// Round 13 (mesh-signals)), not the 1/2^d of its mesh alone.
    /// </summary>
    public bool MeshCheck { get; init; }

    /// <summary>Upper bound on the working memory a finite crystal may claim, in bytes.</summary>
    public long MemoryLimitBytes { get; init; } = 2L << 30;

    /// <summary>Lattice thermal-conductivity estimates; null = not computed.</summary>
    public ConductivityOptions? Conductivity { get; init; }

    /// <summary>Quasi-harmonic thermal expansion (models with potentials); null = harmonic only. Run by <see cref="PhononSolver.Solve"/> around the harmonic solves.</summary>
    public ExpansionOptions? Expansion { get; init; }

    /// <summary>
    /// Bulk meshes: also the plain sum of F over the mesh's modes (<see cref="Results.PointResult.MeshModeSums"/>),
    /// smooth in the volume, for the quasi-harmonic loop; set by it, not by users.
    /// </summary>
    internal bool MeshModeSums { get; init; }
}
