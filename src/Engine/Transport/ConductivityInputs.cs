using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Transport;

/// <summary>The channel parameters resolved against the model: what the rates use, in SI, and the numbers reported with them.</summary>
internal sealed record ConductivityInputs
{
    public required ScatteringRates Rates { get; init; }
    public required double VolumePerCellM3 { get; init; }
    public required double BoundaryLengthNm { get; init; }
    public required double MassVarianceGamma { get; init; }
    public required double UmklappThetaK { get; init; }
    public required double UmklappSpeedMPerS { get; init; }

    /// <summary>
    /// Volume per primitive cell: the cell volume in 3D, cell area x thickness in 2D, lattice constant x
    /// cross-section in 1D (docs/conductivity.md, "What volume means").
    /// </summary>
    public static double VolumePerCell(Lattice lattice, ConductivityOptions options) => lattice.Dimension switch
    {
        1 => lattice.CellMeasure * options.CrossSectionNm2!.Value * 1e-18,
        2 => lattice.CellMeasure * options.ThicknessNm!.Value * 1e-9,
        _ => lattice.CellMeasure,
    };

    /// <summary>
    /// L_eff of a finite crystal: its smallest extent N_i |a_i| over the lattice's directions.
    /// </summary>
    public static double SampleLengthNm(Lattice lattice, FiniteSample sample)
    {
        var smallest = double.PositiveInfinity;
        for (var i = 0; i < lattice.Dimension; i++)
        {
            smallest = Math.Min(smallest, sample[i] * lattice.Vector(i).Length * 1e9);
        }

        return smallest;
    }

    public static ConductivityInputs Resolve(CrystalModel model, Sample sample, ConductivityOptions options, AcousticAverages acoustic)
    {
        var lattice = model.Lattice;
        var volume = VolumePerCell(lattice, options);
        var atoms = model.Sites.Length;
        var rates = new ScatteringRates();

        var length = double.NaN;
        if (options.Boundary is { } boundary)
        {
            length = boundary.LengthNm ?? SampleLengthNm(lattice, (FiniteSample)sample);
            var p = boundary.Specularity;
            rates = rates with { BoundaryOn = true, BoundaryPerMetre = (1 - p) / ((1 + p) * length * 1e-9) };
        }

        var gamma = double.NaN;
        if (options.PointDefects is { } defects)
        {
            gamma = defects.MassVarianceGamma ?? BasisGamma(model, defects);
            var v = acoustic.DebyeSpeedMPerS;
            rates = rates with { PointDefectOn = true, PointDefectCoefficient = volume / atoms * gamma / (4 * Math.PI * v * v * v) };
        }

        double theta = double.NaN, speed = double.NaN;
        if (options.Umklapp is { } umklapp)
        {
            theta = umklapp.DebyeTemperatureK ?? acoustic.AcousticDebyeTemperatureK;
            speed = umklapp.SoundSpeedMPerS ?? acoustic.DebyeSpeedMPerS;
            var meanMassKg = model.CellMassAmu / atoms * PhysicalConstants.AtomicMassKg;
            var g = options.GrueneisenParameter!.Value;
            rates = rates with
            {
                UmklappOn = true,
                UmklappThetaK = theta,
                UmklappCoefficient = PhysicalConstants.HbarJS * g * g / (meanMassKg * speed * speed * theta),
            };
        }

        if (options.Constant is { } constant)
        {
            rates = rates with { ConstantOn = true, ConstantRate = 1.0 / (constant.RelaxationTimePs * 1e-12) };
        }

        return new ConductivityInputs
        {
            Rates = rates,
            VolumePerCellM3 = volume,
            BoundaryLengthNm = length,
            MassVarianceGamma = gamma,
            UmklappThetaK = theta,
            UmklappSpeedMPerS = speed,
        };
    }

    /// <summary>Gamma per atom of the basis; sites without a composition are pure (Gamma 0) at the model's mass.</summary>
    private static double BasisGamma(CrystalModel model, PointDefectScattering defects)
    {
        var gammas = new double[model.Sites.Length];
        foreach (var site in defects.Sites)
        {
            var composition = site.NaturalElement is { } symbol && NaturalIsotopes.TryGet(symbol, out var isotopes)
                ? NaturalIsotopes.Composition(isotopes)
                : site.Masses;
            gammas[model.SiteIndex(site.SiteLabel)] = MassVariance.OfSite(composition);
        }

        return MassVariance.OfBasis([.. model.Sites.Select(s => s.MassAmu)], gammas);
    }
}
