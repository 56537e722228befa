using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Planning;

public sealed class PointBinderTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    private PointRequest BindFirst(string text) { var plan = Some.Load(_dir, text); return PointBinder.Bind(plan, plan.Points[0]); }

    [Fact]
    public void Hexagonal_lattice_with_c_is_three_dimensional_and_takes_three_cell_counts()
    {
        var r = BindFirst("""
            [model]
            lattice = "hexagonal"
            constant_nm = 0.3
            c_nm = 0.5
            [[model.sites]]
            label = "X"
            element = "Zn"
            [[model.springs]]
            from = "Zn"
            to = "Zn"
            longitudinal_n_per_m = 10
            transverse_n_per_m = 1
            [sample]
            kind = "finite"
            cells = [4, 4, 2]
            """);
        Assert.Equal(3, r.Model.Lattice.Dimension);
        Assert.Equal("Zn", r.Model.Sites[0].Kind);
        Assert.True(Elements.TryGetStandardAtomicWeightAmu("Zn", out var zn));
        Assert.Equal(zn, r.Model.Sites[0].MassAmu);
        var s = Assert.IsType<FiniteSample>(r.Sample);
        Assert.Equal((4, 4, 2), (s.N1, s.N2, s.N3));
    }

    [Fact]
    public void Explicit_vectors_bonds_and_a_tensor_reach_the_engine()
    {
        var r = BindFirst("""
            [model]
            lattice = "explicit"
            vectors_nm = [[0.4, 0, 0], [0, 0.5]]
            motion = "3d"
            [[model.sites]]
            label = "P"
            mass_amu = 31
            [[model.sites]]
            label = "Q"
            mass_amu = 16
            position = [0.5, 0.5]
            [[model.bonds]]
            from = "P"
            to = "Q"
            longitudinal_n_per_m = 20
            transverse_n_per_m = 2
            [[model.bonds]]
            from = "P"
            to = "P"
            cell = [1, 0]
            tensor_n_per_m = [5, 1, 0, 1, 4, 0, 0, 0, 3]
            [sample]
            kind = "bulk"
            mesh = [6, 4]
            """);
        Assert.Equal(LatticeKind.Explicit, r.Model.Lattice.Kind);
        Assert.Equal(2, r.Model.Lattice.Dimension);
        Assert.Equal(2, r.Model.BondSprings.Length);
        Assert.Equal(new IntVec3(1, 0, 0), r.Model.BondSprings[1].CellOffset);
        Assert.Equal(1.0, r.Model.BondSprings[1].TensorNPerM!.Value.Xy);
        var bulk = Assert.IsType<BulkSample>(r.Sample);
        Assert.Equal((6, 4, 1), (bulk.M1, bulk.M2, bulk.M3));
    }

    [Fact]
    public void Elastic_section_builds_a_fitted_cubic_model()
    {
        var text = """
            [model.elastic]
            lattice = "fcc"
            constant_nm = 0.36
            element = "Cu"
            c11_gpa = 170
            c12_gpa = 120
            c44_gpa = 75
            next_nearest = true
            [sample]
            kind = "bulk"
            mesh = 8
            [[sweep.axes]]
            path = "model.elastic.c44_gpa"
            values = [60, 75]
            """;
        var plan = Some.Load(_dir, text);
        Assert.Equal(2, plan.Points.Length);
        var r = PointBinder.Bind(plan, plan.Points[1]);
        Assert.Equal(LatticeKind.FaceCentredCubic, r.Model.Lattice.Kind);
        Assert.True(Elements.TryGetStandardAtomicWeightAmu("Cu", out var cu));
        Assert.Equal(cu, r.Model.Sites[0].MassAmu);
        Assert.Equal("GPa", plan.Axes[0].Unit);
        Assert.Equal("elastic_c44_gpa", plan.Axes[0].ColumnName);
    }

    [Fact]
    public void Output_section_becomes_the_solve_options()
    {
        var plan = Some.Load(_dir, Some.ChainJob(output: """
            reference_temperature_k = 77
            dos_bins = 64
            dos_method = "gaussian"
            gaussian_sigma_thz = 0.1
            partial_dos = false
            mode_list_max_modes = 500
            tables = ["thermal", "dispersion"]
            [output.dispersion]
            points_per_segment = 20
            path = [{ label = "G", q = [0] }, { label = "X", q = [0.5] }]
            """));
        var o = plan.Template.Options;
        Assert.Equal([10.0, 100, 300], o.TemperaturesK.ToArray());
        Assert.Equal(77, o.ReferenceTemperatureK);
        Assert.Equal(64, o.DosBins);
        Assert.Equal(DosMethod.Gaussian, o.DosMethod);
        Assert.Equal(0.1, o.GaussianSigmaThz);
        Assert.False(o.PartialDos);
        Assert.Equal(500, o.ModeListMaxModes);
        Assert.Equal(["G", "X"], o.Dispersion!.Corners.Select(c => c.Label));
        Assert.Equal(20, o.Dispersion.PointsPerSegment);
        Assert.Equal(["points", "thermal", "dispersion"], plan.Outputs.TableNames.ToArray());
    }

    [Fact]
    public void Temperature_range_on_a_log_scale()
    {
        var plan = Some.Load(_dir, Some.ChainJob().Replace("temperatures_k = [10, 100, 300]", "temperature_range = { from_k = 1, to_k = 100, steps = 3, scale = \"log\" }", StringComparison.Ordinal));
        Assert.Equal(1.0, plan.Template.Options.TemperaturesK[0]);
        Assert.Equal(10.0, plan.Template.Options.TemperaturesK[1], 1e-12);
        Assert.Equal(100.0, plan.Template.Options.TemperaturesK[2]);
    }

    [Fact]
    public void Swept_element_replaces_the_mass_unless_the_mass_is_swept_too()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites.A.element"
            values = ["Si", "Ge"]
            """));
        Assert.True(Elements.TryGetStandardAtomicWeightAmu("Ge", out var ge));
        Assert.Equal(ge, PointBinder.Bind(plan, plan.Points[1]).Model.Sites[0].MassAmu);
        Assert.Equal("A", PointBinder.Bind(plan, plan.Points[1]).Model.Sites[0].Kind);

        var both = Some.Load(_dir, Some.ChainJob(sweep: """
            combine = "zip"
            [[sweep.axes]]
            path = "model.sites.A.mass_amu"
            values = [29.97, 73.92]
            [[sweep.axes]]
            path = "model.sites.A.element"
            values = ["Si", "Ge"]
            """), "both.toml");
        Assert.Equal(73.92, PointBinder.Bind(both, both.Points[1]).Model.Sites[0].MassAmu);
    }

    [Fact]
    public void Model_the_engine_rejects_fails_the_point_with_a_model_exception()
    {
        // Two sites on one spot: valid input, but no crystal; the Engine says why when the point is bound.
        var plan = Some.Load(_dir, Some.ChainJob().Replace("position = [0.5]", "position = [0.0]", StringComparison.Ordinal));
        var e = Assert.Throws<ModelException>(() => PointBinder.Bind(plan, plan.Points[0]));
        Assert.Equal(ModelProblemKind.OverlappingSites, e.Kind);
    }

    [Fact]
    public void Sites_are_addressable_by_index_as_well_as_by_label()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: """
            [[sweep.axes]]
            path = "model.sites[1].mass_amu"
            values = [7]
            """));
        Assert.Equal("model.sites.B.mass_amu", plan.Axes[0].Path);
        Assert.Equal(7.0, PointBinder.Bind(plan, plan.Points[0]).Model.Sites[1].MassAmu);
    }
}
