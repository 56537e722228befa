using System.Net;
using LatticeSweep.Dashboard.Tests.Support;

namespace LatticeSweep.Dashboard.Tests.Security;

/// <summary>No page reads a file outside the output root: traversal, absolute paths and links out of it get 404.</summary>
public sealed class PathTraversalTests : IClassFixture<SecurityFixture>
{
    private readonly SecurityFixture _f;

    public PathTraversalTests(SecurityFixture f)
    {
        _f = f;
    }

    public static TheoryData<string> Attempts =>
    [
        "/files/..%2F..%2F..%2F..%2F..%2F..%2Fetc%2Fpasswd",
        "/files/%2E%2E/%2E%2E/%2E%2E/%2E%2E/%2E%2E/etc/passwd",
        "/files/../../../../../../etc/passwd",
        "/files/%2Fetc%2Fpasswd",
        "/files//etc/passwd",
        "/files/..%5C..%5C..%5Cetc%5Cpasswd",
        "/files/{sweep}/..%2F..%2F..%2F..%2F..%2F..%2F..%2Fetc%2Fpasswd",
        "/files/{sweep}/points/..%2F..%2F..%2F..%2F..%2F..%2F..%2F..%2Fetc",
        "/files/..%2F",
        "/sweeps/..%2F..%2Fetc%2Fpasswd",
        "/sweeps/{sweep}/points/..%2F..%2F..%2Fetc%2Fpasswd",
        "/api/sweeps/..%2F..%2Fetc/points/passwd/curves",
        "/css/..%2F..%2F..%2F..%2F..%2F..%2F..%2Fetc%2Fpasswd",
        "/lib/chartjs/..%2F..%2F..%2FDashboard.dll",
    ];

    [Theory]
    [MemberData(nameof(Attempts))]
    public async Task A_path_traversal_attempt_gets_404(string attempt)
    {
        using var http = _f.Open.Client();
        var path = attempt.Replace("{sweep}", _f.SweepId, StringComparison.Ordinal);
        var uri = new Uri(_f.Open.Address + path.TrimStart('/'), new UriCreationOptions { DangerousDisablePathAndQueryCanonicalization = true });
        using var response = await http.GetAsync(uri);
        var body = await response.Content.ReadAsStringAsync();
        Assert.True(response.StatusCode == HttpStatusCode.NotFound, $"{path}: {(int)response.StatusCode}\n{body[..Math.Min(400, body.Length)]}");
        Assert.DoesNotContain("root:", body, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_link_out_of_the_output_root_gets_404_and_a_link_inside_it_works()
    {
        var outside = Path.Combine(_f.Store.Folder, "secret");
        Directory.CreateDirectory(outside);
        await File.WriteAllTextAsync(Path.Combine(outside, "notes.txt"), "not for the dashboard");
        Directory.CreateSymbolicLink(Path.Combine(_f.Store.OutputRoot, "escape"), outside);
        File.CreateSymbolicLink(Path.Combine(_f.Store.OutputRoot, "escape.txt"), Path.Combine(outside, "notes.txt"));
        Directory.CreateSymbolicLink(Path.Combine(_f.Store.OutputRoot, "latest"), Path.Combine(_f.Store.OutputRoot, _f.SweepId));

        using var http = _f.Open.Client();
        foreach (var path in new[] { "/files/escape", "/files/escape/notes.txt", "/files/escape.txt" })
        {
            using var response = await http.GetAsync(path);
            Assert.True(response.StatusCode == HttpStatusCode.NotFound, path);
            Assert.DoesNotContain("not for the dashboard", await response.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        }

        var root = await Html.GetAsync(http, "/files/");
        var names = root.QuerySelectorAll("#entries tbody a").Select(a => a.TextContent.Trim()).ToList();
        Assert.DoesNotContain("escape/", names);
        Assert.DoesNotContain("escape.txt", names);
        Assert.Contains(_f.SweepId + "/", names);

        using var inside = await http.GetAsync("/files/latest/sweep.json");
        Assert.Equal(HttpStatusCode.OK, inside.StatusCode);
    }

    [Theory]
    [MemberData(nameof(OutputRootTests.ChainLengths), MemberType = typeof(OutputRootTests))]
    public async Task A_chain_of_links_inside_the_root_serves_only_what_ends_inside_it(int links)
    {
        var outside = Path.Combine(_f.Store.Folder, $"secret-{links}");
        Directory.CreateDirectory(outside);
        await File.WriteAllTextAsync(Path.Combine(outside, "notes.txt"), "not for the dashboard");
        var folder = Path.Combine(_f.Store.OutputRoot, $"chains-{links}");
        Directory.CreateDirectory(folder);
        await File.WriteAllTextAsync(Path.Combine(folder, "fine.txt"), "fine to serve");
        OutputRootTests.Chain(folder, "out", links, Path.Combine(outside, "notes.txt"));
        OutputRootTests.Chain(folder, "in", links, Path.Combine(folder, "fine.txt"));
        File.CreateSymbolicLink(Path.Combine(folder, "loop-a"), Path.Combine(folder, "loop-b"));
        File.CreateSymbolicLink(Path.Combine(folder, "loop-b"), Path.Combine(folder, "loop-a"));

        using var http = _f.Open.Client();
        foreach (var path in new[] { $"/files/chains-{links}/out-1", $"/files/chains-{links}/loop-a" })
        {
            using var response = await http.GetAsync(path);
            Assert.True(response.StatusCode == HttpStatusCode.NotFound, $"{path}: {(int)response.StatusCode}");
            Assert.DoesNotContain("not for the dashboard", await response.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        }

        using var inside = await http.GetAsync($"/files/chains-{links}/in-1");
        Assert.Equal(HttpStatusCode.OK, inside.StatusCode);
        Assert.Equal("fine to serve", await inside.Content.ReadAsStringAsync());
        var listing = await Html.GetAsync(http, $"/files/chains-{links}");
        var names = listing.QuerySelectorAll("#entries tbody a").Select(a => a.TextContent.Trim()).ToList();
        Assert.Contains("in-1", names);
        Assert.DoesNotContain("out-1", names);
        Assert.DoesNotContain("loop-a", names);
    }

    [Fact]
    public async Task A_writers_hidden_temporary_file_is_not_served()
    {
        var hidden = Path.Combine(_f.Store.OutputRoot, _f.SweepId, "points", ".part-c99999.abc.tmp");
        await File.WriteAllTextAsync(hidden, "half written");
        using var http = _f.Open.Client();
        using var response = await http.GetAsync($"/files/{_f.SweepId}/points/.part-c99999.abc.tmp");
        Assert.Equal(HttpStatusCode.NotFound, response.StatusCode);
        var listing = await Html.GetAsync(http, $"/files/{_f.SweepId}/points");
        Assert.DoesNotContain(listing.QuerySelectorAll("#entries tbody a"), a => a.TextContent.Contains(".part-", StringComparison.Ordinal));
    }
}
