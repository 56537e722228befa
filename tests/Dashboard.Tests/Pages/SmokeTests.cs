using LatticeSweep.Dashboard.Tests.Support;

namespace LatticeSweep.Dashboard.Tests.Pages;

[Collection(StandardCollection.Name)]
public sealed class SmokeTests
{
    private readonly StandardFixture _f;

    public SmokeTests(StandardFixture f)
    {
        _f = f;
    }

    [Fact]
    public async Task Pages_answer()
    {
        using var http = _f.Server.Client();
        foreach (var path in new[] { "/", "/api/sweeps", $"/sweeps/{_f.FinishedId}", $"/sweeps/{_f.RunningId}", $"/sweeps/{_f.FailuresId}" })
        {
            var r = await http.GetAsync(path);
            var body = await r.Content.ReadAsStringAsync();
            File.WriteAllText(Path.Combine("/tmp", "dash-" + path.Replace('/', '_') + ".html"), body);
            Assert.True(r.IsSuccessStatusCode, path + " " + r.StatusCode + body);
        }
    }
}
