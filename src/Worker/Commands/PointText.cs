using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Worker.Commands;

/// <summary>How commands show a point's swept parameters: <c>(column = value, ...)</c>, values as stored.</summary>
internal static class PointText
{
    public static string Parameters(IEnumerable<KeyValuePair<string, object>> parameters)
    {
        var list = parameters.ToList();
        return list.Count == 0 ? "(the unswept model)" : "(" + string.Join(", ", list.Select(p => $"{p.Key} = {CatalogJson.Show(p.Value)}")) + ")";
    }
}
