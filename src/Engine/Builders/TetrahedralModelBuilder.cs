using LatticeSweep.Engine.Elastic;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Interactions;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Engine.Builders;

/// <summary>Builds diamond and zinc-blende models with bond-stretch and Keating bond-bend terms, or fits those two constants to C11, C12, C44.</summary>
public static class TetrahedralModelBuilder
{
    /// <summary>Site labels (and kinds) of the two sites of the cell.</summary>
    public const string SiteA = "A";
    public const string SiteB = "B";

    public static CrystalModel Build(TetrahedralModelSpec spec)
    {
        ArgumentNullException.ThrowIfNull(spec);
        Guard.PositiveFinite(spec.ConstantNm, "model.tetrahedral.constant_nm", "the lattice constant");
        var massB = spec.Structure == TetrahedralStructure.Diamond ? spec.MassAAmu : spec.MassBAmu;
        return CrystalModel.Create(
            Lattice.FaceCentredCubic(spec.ConstantNm),
            [new Site(SiteA, SiteA, Vec3.Zero, spec.MassAAmu), new Site(SiteB, SiteB, new Vec3(0.25, 0.25, 0.25), massB)],
            [new ShellSpring(SiteA, SiteB, 1, spec.StretchNPerM)],
            degreesOfFreedom: spec.DegreesOfFreedom,
            bends: [new BendSpring(SiteA, SiteB, 1, BendForm.Keating, spec.BendNPerM), new BendSpring(SiteB, SiteA, 1, BendForm.Keating, spec.BendNPerM)]);
    }

    /// <summary>
    /// The model whose stretch and bend constants fit <paramref name="target"/> best in the least-squares
    /// sense over (C11, C12, C44), and that fit.
    /// </summary>
    public static CrystalModel BuildFitted(TetrahedralStructure structure, double constantNm, double massAAmu, double massBAmu, CubicElasticConstants target, out ElasticFitResult fit, DegreesOfFreedom degreesOfFreedom = DegreesOfFreedom.Cartesian)
    {
        var massB = structure == TetrahedralStructure.Diamond ? massAAmu : massBAmu;
        fit = BondBendingFit.Fit(structure, constantNm, massAAmu + massB, target);
        // The fit travels with the model, as the central-spring fit's does, so every solve reports it.
        return Build(new TetrahedralModelSpec(structure, constantNm, massAAmu, massBAmu, fit.NearestNPerM, fit.BendNPerM!.Value, degreesOfFreedom)) with { ElasticFit = fit };
    }
}
