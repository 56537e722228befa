using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Engine.Tests.Support;
using LatticeSweep.Engine.Transport;

namespace LatticeSweep.Engine.Tests.Transport;

/// <summary>Bad conductivity settings fail before anything is solved, each with its key and what to change.</summary>
public class ConductivityOptionsValidationTests
{
    private static ModelException Fails(ConductivityOptions conductivity, Sample? sample = null, CrystalModel? model = null)
    {
        var options = new SolveOptions { Conductivity = conductivity };
        return Assert.Throws<ModelException>(() => PhononSolver.Solve(model ?? Crystals.FccCentral(), sample ?? BulkSample.Uniform(3, 8), options));
    }

    private static void HasProblem(ModelException e, string where, string containing)
    {
        Assert.Contains(e.Problems, p => p.Where == where && p.Message.Contains(containing, StringComparison.Ordinal));
    }

    [Fact]
    public void No_channel_is_refused()
    {
        HasProblem(Fails(new ConductivityOptions()), "output.conductivity", "at least one scattering channel");
    }

    [Fact]
    public void Sheets_and_chains_need_their_thickness_or_cross_section_and_3D_takes_neither()
    {
        var constant = new ConductivityOptions { Constant = new ConstantScattering(1) };
        HasProblem(Fails(constant, BulkSample.Uniform(2, 8), Crystals.ScalarSquare()), "output.conductivity.thickness_nm", "sheet thickness");
        HasProblem(Fails(constant, FiniteSample.Create(8), Crystals.ScalarChain()), "output.conductivity.cross_section_nm2", "cross-section");
        var e = Fails(constant with { ThicknessNm = 1, CrossSectionNm2 = 1 });
        HasProblem(e, "output.conductivity.thickness_nm", "only a 2D lattice");
        HasProblem(e, "output.conductivity.cross_section_nm2", "only a 1D lattice");
        HasProblem(Fails(constant with { ThicknessNm = -1 }, BulkSample.Uniform(2, 8), Crystals.ScalarSquare()), "output.conductivity.thickness_nm", "> 0 nm");
    }

    [Fact]
    public void Every_bad_channel_value_is_reported_at_once()
    {
        var e = Fails(new ConductivityOptions
        {
            Boundary = new BoundaryScattering { Specularity = 1.5 },
            Umklapp = new UmklappScattering { DebyeTemperatureK = -3 },
            Constant = new ConstantScattering(0),
            PointDefects = new PointDefectScattering { MassVarianceGamma = double.NaN },
        });
        HasProblem(e, "output.conductivity.boundary.length_nm", "bulk sample has no size");
        HasProblem(e, "output.conductivity.boundary.specularity", "[0, 1]");
        HasProblem(e, "output.conductivity.grueneisen_parameter", "needs the Grueneisen parameter");
        HasProblem(e, "output.conductivity.umklapp.debye_temperature_k", "> 0 K");
        HasProblem(e, "output.conductivity.constant.relaxation_time_ps", "> 0 ps");
        HasProblem(e, "output.conductivity.point_defects.gamma", ">= 0");
        Assert.Equal(6, e.Problems.Count);
    }

    [Fact]
    public void Compositions_are_checked_against_the_basis_and_the_isotope_table()
    {
        var e = Fails(new ConductivityOptions
        {
            Constant = new ConstantScattering(1),
            PointDefects = new PointDefectScattering
            {
                Sites =
                [
                    new SiteComposition { SiteLabel = "B", NaturalElement = "Si" },
                    new SiteComposition { SiteLabel = "A", NaturalElement = "Xx" },
                    new SiteComposition { SiteLabel = "A", Masses = [new(20, 0.5), new(21, 0.4)] },
                ],
            },
        });
        HasProblem(e, "output.conductivity.point_defects.sites[0].site", "no site is labelled 'B'");
        HasProblem(e, "output.conductivity.point_defects.sites[1].element", "no natural isotopic composition for 'Xx'");
        HasProblem(e, "output.conductivity.point_defects.sites[2].masses", "add up to 1");
        HasProblem(e, "output.conductivity.point_defects.sites[2].site", "has two compositions");
    }

    [Fact]
    public void A_composition_whose_mean_mass_is_not_the_site_mass_is_refused()
    {
        // FccCentral's site has 20 amu; natural copper averages 63.55 amu.
        var e = Fails(new ConductivityOptions
        {
            Constant = new ConstantScattering(1),
            PointDefects = new PointDefectScattering { Sites = [new SiteComposition { SiteLabel = "A", NaturalElement = "Cu" }] },
        });
        HasProblem(e, "output.conductivity.point_defects.sites[0]", "virtual crystal");
    }

    [Fact]
    public void A_bulk_mesh_too_coarse_to_halve_is_refused()
    {
        HasProblem(Fails(new ConductivityOptions { Constant = new ConstantScattering(1) }, BulkSample.Create(8, 3, 8)), "sample.mesh[1]", "at least 4");
    }
}
