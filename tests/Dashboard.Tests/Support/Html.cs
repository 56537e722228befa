using System.Globalization;
using System.Net;
using AngleSharp.Dom;
using AngleSharp.Html.Parser;

namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>Fetches pages and reads them as HTML documents.</summary>
internal static class Html
{
    public static async Task<IDocument> GetAsync(HttpClient http, string path, HttpStatusCode expected = HttpStatusCode.OK)
    {
        using var response = await http.GetAsync(path);
        var text = await response.Content.ReadAsStringAsync();
        Assert.True(response.StatusCode == expected, $"GET {path}: {(int)response.StatusCode} {response.StatusCode}, expected {expected}\n{text[..Math.Min(text.Length, 2000)]}");
        return new HtmlParser().ParseDocument(text);
    }

    /// <summary>The exact value a cell carries in its data-value attribute.</summary>
    public static string Raw(IElement scope, string field) =>
        (scope.QuerySelector($"[data-field='{field}']") ?? throw new Xunit.Sdk.XunitException($"no [data-field='{field}'] in {scope.TagName}"))
            .GetAttribute("data-value") ?? "";

    public static long Long(IElement scope, string field) => long.Parse(Raw(scope, field), CultureInfo.InvariantCulture);

    public static double Double(IElement scope, string field) => double.Parse(Raw(scope, field), CultureInfo.InvariantCulture);

    public static string Text(IElement scope, string field) =>
        (scope.QuerySelector($"[data-field='{field}']") ?? throw new Xunit.Sdk.XunitException($"no [data-field='{field}']")).TextContent.Trim();
}
