using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Worker.Tests.Catalog;

public sealed class FailureTextTests
{
    public static TheoryData<FailureOrigin> Origins => new()
    {
        new FailureOrigin(FailureOriginKind.SweptValue, [new OriginKey("model.sites.B.position[0]", "/tmp/a b/job [1].toml:7:1")]),
        new FailureOrigin(FailureOriginKind.SweptValue, [new OriginKey("model.springs[0].transverse_n_per_m", "/j.toml:15:1"), new OriginKey("model.sites[1].mass_amu", "/j.toml:3:9")]),
        new FailureOrigin(FailureOriginKind.SweptTogether, [new OriginKey("sample.cells", "/j.toml:2:1"), new OriginKey("model.constant_nm", "/j.toml:4:1")]),
        FailureOrigin.JobFile,
        FailureOrigin.Untraced,
        FailureOrigin.Solver,
    };

    [Theory]
    [MemberData(nameof(Origins))]
    public void A_composed_text_splits_back_into_its_reason_and_origin(FailureOrigin origin)
    {
        const string reason = "model.sites[1].position: site 'B' sits on site 'A' [really] (same position)";
        var (back, parsed) = FailureText.Split(FailureText.Compose(reason, origin));
        Assert.Equal(reason, back);
        Assert.NotNull(parsed);
        Assert.Equal(origin.Kind, parsed.Kind);
        Assert.Equal(origin.Keys.ToArray(), parsed.Keys.ToArray());
        Assert.Equal(origin, parsed);
    }

    [Theory]
    [InlineData("results could not be written to /out: the disk is full (No space left on device) (run resume once the folder is writable)")]
    [InlineData("mass must be > 0")]
    [InlineData("a reason ending in a bracket [of its own]")]
    [InlineData("")]
    public void A_text_without_an_origin_is_its_own_reason(string error)
    {
        var (reason, origin) = FailureText.Split(error);
        Assert.Equal(error, reason);
        Assert.Null(origin);
    }

    [Fact]
    public void A_group_shows_few_values_one_by_one_and_many_as_a_range()
    {
        var few = new FailingValues("springs_0_transverse_n_per_m", "model.springs[0].transverse_n_per_m", 2, [0.0, -2.0], -2, 0, 3);
        Assert.Equal("springs_0_transverse_n_per_m = 0, -2 (2 of 3 values)", few.ToString());
        var many = new FailingValues("mass_amu", "model.sites.A.mass_amu", 40, [1.0, 2.0, 3.0, 4.0, 5.0], 0.5, 9.5, 200);
        Assert.Equal("mass_amu from 0.5 to 9.5 (40 of 200 values)", many.ToString());
        var text = new FailingValues("kind", "sample.kind", 6, ["a", "b", "c", "d", "e"], null, null, 0);
        Assert.Equal("kind = a, b, c, d, e, ... (6 values)", text.ToString());
    }
}
