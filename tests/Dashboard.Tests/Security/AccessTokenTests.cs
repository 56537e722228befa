using System.Net;
using System.Net.Http.Headers;
using LatticeSweep.Dashboard.Tests.Support;

namespace LatticeSweep.Dashboard.Tests.Security;

/// <summary>With an access token set, every request needs it: header, bearer, or the cookie a one-time link sets.</summary>
public sealed class AccessTokenTests : IClassFixture<SecurityFixture>
{
    private readonly SecurityFixture _f;

    public AccessTokenTests(SecurityFixture f)
    {
        _f = f;
    }

    public static TheoryData<string> Paths => ["/", "/api/sweeps", "/sweeps/{sweep}", "/api/sweeps/{sweep}/results", "/files/", "/queue", "/css/site.css", "/lib/chartjs/chart.umd.min.js", "/no-such-page"];

    [Theory]
    [MemberData(nameof(Paths))]
    public async Task A_request_without_the_token_is_refused(string path)
    {
        using var http = _f.Guarded.Client();
        using var response = await http.GetAsync(path.Replace("{sweep}", _f.SweepId, StringComparison.Ordinal));
        Assert.Equal(HttpStatusCode.Unauthorized, response.StatusCode);
        var body = await response.Content.ReadAsStringAsync();
        Assert.Contains("access token", body, StringComparison.Ordinal);
        Assert.DoesNotContain(_f.SweepId, body, StringComparison.Ordinal);
    }

    [Fact]
    public async Task A_wrong_token_is_refused_everywhere_it_can_be_given()
    {
        using var http = _f.Guarded.Client();
        using var header = new HttpRequestMessage(HttpMethod.Get, "/api/sweeps");
        header.Headers.Add("X-Access-Token", SecurityFixture.Token + "x");
        Assert.Equal(HttpStatusCode.Unauthorized, (await http.SendAsync(header)).StatusCode);
        using var bearer = new HttpRequestMessage(HttpMethod.Get, "/api/sweeps");
        bearer.Headers.Authorization = new AuthenticationHeaderValue("Bearer", "not-the-token-at-all");
        Assert.Equal(HttpStatusCode.Unauthorized, (await http.SendAsync(bearer)).StatusCode);
        Assert.Equal(HttpStatusCode.Unauthorized, (await http.GetAsync("/?token=" + SecurityFixture.Token[..^1])).StatusCode);
        using var cookie = new HttpRequestMessage(HttpMethod.Get, "/");
        cookie.Headers.Add("Cookie", "latsweep_access=" + SecurityFixture.Token);
        Assert.Equal(HttpStatusCode.Unauthorized, (await http.SendAsync(cookie)).StatusCode);
    }

    [Fact]
    public async Task The_token_in_a_header_or_as_bearer_lets_a_script_in()
    {
        using var http = _f.Guarded.Client();
        using var header = new HttpRequestMessage(HttpMethod.Get, "/api/sweeps");
        header.Headers.Add("X-Access-Token", SecurityFixture.Token);
        using var r1 = await http.SendAsync(header);
        Assert.Equal(HttpStatusCode.OK, r1.StatusCode);
        Assert.Contains(_f.SweepId, await r1.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        using var bearer = new HttpRequestMessage(HttpMethod.Get, $"/sweeps/{_f.SweepId}");
        bearer.Headers.Authorization = new AuthenticationHeaderValue("Bearer", SecurityFixture.Token);
        Assert.Equal(HttpStatusCode.OK, (await http.SendAsync(bearer)).StatusCode);
    }

    [Fact]
    public async Task A_token_link_sets_a_cookie_and_redirects_to_the_address_without_the_token()
    {
        using var http = _f.Guarded.Client();
        using var link = await http.GetAsync($"/sweeps/{_f.SweepId}?sort=max_freq_thz&token={SecurityFixture.Token}");
        Assert.Equal(HttpStatusCode.Redirect, link.StatusCode);
        Assert.Equal($"/sweeps/{_f.SweepId}?sort=max_freq_thz", link.Headers.Location!.OriginalString);
        var setCookie = Assert.Single(link.Headers.GetValues("Set-Cookie"));
        Assert.Contains("httponly", setCookie, StringComparison.OrdinalIgnoreCase);
        Assert.Contains("samesite=strict", setCookie, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain(SecurityFixture.Token, setCookie, StringComparison.Ordinal);

        // The cookie now opens every page, including the queue's.
        Assert.Equal(HttpStatusCode.OK, (await http.GetAsync($"/sweeps/{_f.SweepId}")).StatusCode);
        Assert.Equal(HttpStatusCode.OK, (await http.GetAsync("/api/sweeps")).StatusCode);
        using var queue = await http.GetAsync("/queue");
        Assert.Equal(HttpStatusCode.OK, queue.StatusCode);
        Assert.Contains("LatticeSweep queue", await queue.Content.ReadAsStringAsync(), StringComparison.Ordinal);
    }
}
