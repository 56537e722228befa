using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Planning;

public sealed class PointIdentityTests : IDisposable
{
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    private const string Axis = """
        [[sweep.axes]]
        path = "model.sites.B.mass_amu"
        values = [12.0, 24.0, 36.0]
        """;

    [Fact]
    public void Replanning_the_same_file_gives_the_same_ids_and_spec_hash()
    {
        var text = Some.ChainJob(sweep: Axis);
        var a = Some.Load(_dir, text, "a.toml");
        var b = Some.Load(_dir, text, "b.toml");
        Assert.Equal(a.Points.Select(p => p.PointId), b.Points.Select(p => p.PointId));
        Assert.Equal(a.SpecHash, b.SpecHash);
        Assert.All(a.Points, p => Assert.Matches("^[0-9a-f]{16}$", p.PointId));
        Assert.Equal(3, a.Points.Select(p => p.PointId).Distinct().Count());
    }

    [Fact]
    public void Ids_do_not_depend_on_key_order_spacing_or_comments()
    {
        var text = Some.ChainJob(sweep: Axis);
        var reordered = text
            .Replace("lattice = \"chain\"\nconstant_nm = 0.5", "# the same chain\nconstant_nm   =   0.50\nlattice = \"chain\"", StringComparison.Ordinal)
            .Replace("from = \"A\"\nto = \"B\"", "to = \"B\"\nfrom = \"A\"", StringComparison.Ordinal);
        Assert.NotEqual(text, reordered);
        var a = Some.Load(_dir, text, "a.toml");
        var b = Some.Load(_dir, reordered, "b.toml");
        Assert.Equal(a.Points.Select(p => p.PointId), b.Points.Select(p => p.PointId));
        Assert.Equal(a.SpecHash, b.SpecHash);
    }

    [Fact]
    public void Extending_an_axis_keeps_the_ids_of_the_existing_points()
    {
        var small = Some.Load(_dir, Some.ChainJob(sweep: Axis), "a.toml");
        var larger = Some.Load(_dir, Some.ChainJob(sweep: Axis.Replace("36.0]", "36.0, 48.0]", StringComparison.Ordinal)), "b.toml");
        Assert.Equal(small.Points.Select(p => p.PointId), larger.Points.Take(3).Select(p => p.PointId));
        Assert.NotEqual(small.SpecHash, larger.SpecHash);
    }

    [Fact]
    public void A_change_outside_the_sweep_changes_every_id()
    {
        var a = Some.Load(_dir, Some.ChainJob(sweep: Axis), "a.toml");
        var b = Some.Load(_dir, Some.ChainJob(sweep: Axis).Replace("constant_nm = 0.5", "constant_nm = 0.6", StringComparison.Ordinal), "b.toml");
        Assert.Empty(a.Points.Select(p => p.PointId).Intersect(b.Points.Select(p => p.PointId)));
    }

    [Fact]
    public void Duplicate_points_are_collapsed_and_counted()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: Some.RepeatingZipSweep));
        Assert.Equal(2, plan.Points.Length);
        Assert.Equal(1, plan.DuplicatePointsCollapsed);
        Assert.Equal([0, 1], plan.Points.Select(p => p.Index));
    }

    [Fact]
    public void Each_repeated_point_is_kept_at_its_first_place_in_plan_order_with_its_own_values()
    {
        var plan = Some.Load(_dir, Some.ChainJob(sweep: """
            combine = "zip"
            [[sweep.axes]]
            path = "model.sites.A.mass_amu"
            values = [3, 1, 2, 1, 3, 4, 2, 1]
            [[sweep.axes]]
            path = "model.sites.B.mass_amu"
            values = [7, 5, 6, 5, 7, 8, 6, 5]
            """));

        Assert.Equal(4, plan.DuplicatePointsCollapsed);
        Assert.Equal([0, 1, 2, 3], plan.Points.Select(p => p.Index));
        Assert.Equal(["3/7", "1/5", "2/6", "4/8"], plan.Points.Select(p => string.Join("/", p.Parameters.OrderBy(kv => kv.Key, StringComparer.Ordinal).Select(kv => kv.Value))));
        Assert.Equal([0L, 1L, 2L, 5L], Enumerable.Range(0, 4).Select(plan.Points.ExpansionPositionOf));
        Assert.Equal(4, plan.Points.Select(p => p.PointId).Distinct().Count());
    }

    [Fact]
    public void Ids_do_not_depend_on_the_culture()
    {
        var text = Some.ChainJob(sweep: Axis);
        var before = Some.Load(_dir, text, "a.toml").Points.Select(p => p.PointId).ToList();
        var culture = System.Globalization.CultureInfo.CurrentCulture;
        try
        {
            System.Globalization.CultureInfo.CurrentCulture = new System.Globalization.CultureInfo("de-DE");
            Assert.Equal(before, Some.Load(_dir, text, "b.toml").Points.Select(p => p.PointId));
        }
        catch (System.Globalization.CultureNotFoundException)
        {
            // Invariant-globalization builds have no de-DE; the invariant formatting is what is tested then.
        }
        finally
        {
            System.Globalization.CultureInfo.CurrentCulture = culture;
        }
    }
}
