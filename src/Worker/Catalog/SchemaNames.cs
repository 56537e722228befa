namespace LatticeSweep.Worker.Catalog;

/// <summary>PostgreSQL schema names the store accepts.</summary>
public static class SchemaNames
{
    /// <summary>
    /// True for a name PostgreSQL treats the same quoted and unquoted: lower-case letters, digits and
    /// underscores, starting with a letter or underscore, at most 63 characters. The queue quotes
    /// its schema name and the catalog reaches its tables through the search path, so both must agree.
    /// </summary>
    public static bool IsPlain(string? name) =>
        name is { Length: > 0 and <= 63 }
        && (name[0] is >= 'a' and <= 'z' || name[0] == '_')
        && name.All(c => c is >= 'a' and <= 'z' or >= '0' and <= '9' or '_');
}
