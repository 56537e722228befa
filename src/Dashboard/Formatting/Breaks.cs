using System.Text.Encodings.Web;
using Microsoft.AspNetCore.Html;

namespace LatticeSweep.Dashboard.Formatting;

/// <summary>Text that may wrap after its dots (a job-file path in a narrow table header), HTML-encoded.</summary>
public static class Breaks
{
    public static IHtmlContent AfterDots(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        return new HtmlString(string.Join(".<wbr>", text.Split('.').Select(part => HtmlEncoder.Default.Encode(part))));
    }
}
