using Microsoft.AspNetCore.Http.Extensions;
using Microsoft.Extensions.Primitives;

namespace LatticeSweep.Dashboard.Security;

/// <summary>
/// With an access token set, lets a request through only when it carries the token: in the
/// <c>X-Access-Token</c> header or as <c>Authorization: Bearer</c> (scripts), or in the access
/// cookie (browsers). A link with <c>?token=</c> sets the cookie once and redirects to the same
/// address without the token, so it does not stay in the address bar or the history.
/// </summary>
internal sealed class AccessTokenMiddleware
{
    public const string HeaderName = "X-Access-Token";
    public const string CookieName = "latsweep_access";
    public const string QueryName = "token";

    private readonly RequestDelegate _next;
    private readonly AccessToken _token;

    public AccessTokenMiddleware(RequestDelegate next, AccessToken token)
    {
        _next = next;
        _token = token;
    }

    public async Task InvokeAsync(HttpContext context)
    {
        var request = context.Request;
        if (request.Query.TryGetValue(QueryName, out var fromQuery) && _token.Matches(fromQuery.ToString()))
        {
            context.Response.Cookies.Append(CookieName, _token.CookieValue, new CookieOptions
            {
                HttpOnly = true,
                SameSite = SameSiteMode.Strict,
                Secure = request.IsHttps,
                Path = "/",
                IsEssential = true,
            });
            var rest = new QueryBuilder(request.Query.Where(q => q.Key != QueryName).SelectMany(q => q.Value.Select(v => new KeyValuePair<string, string>(q.Key, v ?? ""))));
            context.Response.Redirect(request.PathBase + request.Path + rest.ToQueryString());
            return;
        }

        if (_token.Matches(request.Headers[HeaderName].ToString()) || _token.Matches(Bearer(request.Headers.Authorization))
            || _token.MatchesCookie(request.Cookies[CookieName]))
        {
            await _next(context).ConfigureAwait(false);
            return;
        }

        context.Response.StatusCode = StatusCodes.Status401Unauthorized;
        context.Response.ContentType = "text/plain; charset=utf-8";
        await context.Response.WriteAsync(
            "This LatticeSweep dashboard needs its access token. Open the link with ?token=... that was given when it started, " +
            $"or send the token in the {HeaderName} header.\n").ConfigureAwait(false);
    }

    private static string? Bearer(StringValues authorization)
    {
        var value = authorization.ToString();
        return value.StartsWith("Bearer ", StringComparison.OrdinalIgnoreCase) ? value["Bearer ".Length..].Trim() : null;
    }
}
