using System.Text;
using System.Text.Encodings.Web;
using Microsoft.AspNetCore.Html;

namespace LatticeSweep.Dashboard.Formatting;

/// <summary>Text that may wrap at chosen places in a narrow table header, HTML-encoded.</summary>
public static class Breaks
{
    /// <summary>Pieces shorter than this are kept together, so a column name wraps into a few lines, not one per word.</summary>
    private const int MinPiece = 10;

    /// <summary>Text that may wrap after a dot or an underscore (a job-file path, a column name), in pieces of at least ten characters.</summary>
    public static IHtmlContent AfterSeparators(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var sb = new StringBuilder();
        var piece = 0;
        for (var i = 0; i < text.Length; i++)
        {
            sb.Append(HtmlEncoder.Default.Encode(text[i].ToString()));
            piece++;
            if (text[i] is '.' or '_' && piece >= MinPiece && i < text.Length - 1)
            {
                sb.Append("<wbr>");
                piece = 0;
            }
        }

        return new HtmlString(sb.ToString());
    }
}
