using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.JobFiles;

/// <summary>
/// <c>[output] thermal_mesh_check</c>: off by default, on when asked, a clear error for a value that is not a
/// boolean; point ids change only when it is on (invented demo chain).
/// </summary>
public sealed class MeshCheckKeyTests : IDisposable
{
    private const string Bulk = "kind = \"bulk\"\nmesh = 16";
    private readonly TempDirectory _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void Mesh_check_is_off_by_default_and_on_when_asked_with_its_own_point_ids()
    {
        var byDefault = Some.Load(_dir, Some.ChainJob(sample: Bulk));
        var off = Some.Load(_dir, Some.ChainJob(sample: Bulk, output: "thermal_mesh_check = false"), "off.toml");
        var on = Some.Load(_dir, Some.ChainJob(sample: Bulk, output: "thermal_mesh_check = true"), "on.toml");
        Assert.False(byDefault.Template.Options.MeshCheck);
        Assert.True(on.Template.Options.MeshCheck);

        // The default keeps the ids points had before the key existed; on is another computation.
        Assert.Equal(byDefault.Points[0].PointId, off.Points[0].PointId);
        Assert.NotEqual(byDefault.Points[0].PointId, on.Points[0].PointId);
    }

    [Fact]
    public void A_thermal_mesh_check_that_is_not_a_boolean_is_refused_at_its_line()
    {
        var text = Some.ChainJob(sample: Bulk, output: "thermal_mesh_check = \"yes\"");
        var e = Some.Fails(_dir, text);
        var p = Assert.Single(e.Problems);
        Assert.Contains("thermal_mesh_check", p.Key, StringComparison.Ordinal);
        Assert.Equal(Some.LineOf(text, "thermal_mesh_check"), p.Line);
    }
}
