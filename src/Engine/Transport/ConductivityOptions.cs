using System.Collections.Immutable;

namespace LatticeSweep.Engine.Transport;

/// <summary>
/// What a lattice thermal-conductivity estimate takes: the scattering channels combined by
/// Matthiessen's rule (each null = off; at least one must be on), the material numbers the channels
/// and the summary estimates need, and for 2D and 1D lattices the thickness or cross-section that
/// turns a sheet or a chain into a volume. See docs/conductivity.md.
/// </summary>
public sealed record ConductivityOptions
{
    /// <summary>Diffuse or partly specular boundary scattering, rate |v| / L_eff x (1 - p) / (1 + p).</summary>
    public BoundaryScattering? Boundary { get; init; }

    /// <summary>Point defects and isotopes, Rayleigh rate V0 Gamma omega^4 / (4 pi v^3).</summary>
    public PointDefectScattering? PointDefects { get; init; }

    /// <summary>Empirical Umklapp rate (hbar gamma^2 / (M v^2 theta)) omega^2 T exp(-theta / 3T); needs <see cref="GrueneisenParameter"/>.</summary>
    public UmklappScattering? Umklapp { get; init; }

    /// <summary>One relaxation time for every mode, for comparisons.</summary>
    public ConstantScattering? Constant { get; init; }

    /// <summary>Grueneisen parameter gamma (dimensionless, > 0): used by the Umklapp channel and by Slack's estimate (NaN without it).</summary>
    public double? GrueneisenParameter { get; init; }

    /// <summary>2D lattices only (required there): the sheet thickness in nm, so volume per cell = cell area x thickness.</summary>
    public double? ThicknessNm { get; init; }

    /// <summary>1D lattices only (required there): the chain's cross-section in nm^2, so volume per cell = a x cross-section.</summary>
    public double? CrossSectionNm2 { get; init; }

    /// <summary>Bulk meshes: repeat the sum on the mesh of half the density per direction and report the relative change.</summary>
    public bool CheckMeshConvergence { get; init; } = true;

    /// <summary>Collect the cumulative conductivity against phonon mean free path at the reference temperature.</summary>
    public bool MeanFreePathTable { get; init; }

    /// <summary>The channels that are on, in the fixed order of <see cref="ScatteringChannel"/>.</summary>
    public ImmutableArray<ScatteringChannel> Channels
    {
        get
        {
            var on = ImmutableArray.CreateBuilder<ScatteringChannel>(4);
            if (Boundary is not null)
            {
                on.Add(ScatteringChannel.Boundary);
            }

            if (PointDefects is not null)
            {
                on.Add(ScatteringChannel.PointDefect);
            }

            if (Umklapp is not null)
            {
                on.Add(ScatteringChannel.Umklapp);
            }

            if (Constant is not null)
            {
                on.Add(ScatteringChannel.Constant);
            }

            return on.ToImmutable();
        }
    }
}
