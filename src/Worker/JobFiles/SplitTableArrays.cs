using Tomlyn.Syntax;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// Finds an array of tables written in two groups with other tables between them (<c>[[model.sites]]</c>,
/// <c>[[model.springs]]</c>, <c>[[model.sites]]</c>). TOML allows it, but the object reader we use keeps only
/// the last group and drops the earlier tables without a word, so a site, spring or potential would go missing;
/// it is refused at the later header instead.
/// </summary>
internal static class SplitTableArrays
{
    public static (SourceLocation At, string Key, string Message)? Find(DocumentSyntax syntax)
    {
        var firstLine = new Dictionary<string, int>(StringComparer.Ordinal);
        var open = new List<string>();                            // arrays whose group has not been interrupted
        var interrupted = new HashSet<string>(StringComparer.Ordinal);
        foreach (var table in syntax.Tables)
        {
            if (table.Name is null)
            {
                continue;
            }

            var name = Normalise(table.Name.ToString());
            var isArray = table is TableArraySyntax;
            foreach (var array in open.Where(a => !(isArray && name == a) && !name.StartsWith(a + ".", StringComparison.Ordinal)).ToList())
            {
                open.Remove(array);
                interrupted.Add(array);
            }

            if (!isArray)
            {
                continue;
            }

            var line = table.Span.Start.Line + 1;
            if (interrupted.Contains(name))
            {
                return (new SourceLocation(line, table.Span.Start.Column + 1), name,
                    $"[[{name}]] is written again after other tables (the first [[{name}]] is at line {firstLine[name]}): write all [[{name}]] tables one after another, or the earlier ones would be lost");
            }

            firstLine.TryAdd(name, line);
            if (!open.Contains(name))
            {
                open.Add(name);
            }

            // A new element starts its own nested arrays afresh.
            interrupted.RemoveWhere(a => a.StartsWith(name + ".", StringComparison.Ordinal));
        }

        return null;
    }

    private static string Normalise(string key) =>
        string.Concat(key.Where(c => !char.IsWhiteSpace(c) && c != '"' && c != '\''));
}
