using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Planning.Specs;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// Stable ids: the first 16 hex digits of SHA-256 over a canonical, culture-invariant text. A point's
/// id covers its whole spec after its parameters are applied (so it does not depend on key order,
/// spacing or comments in the file, and an axis that gains values keeps the ids of the old points)
/// plus its sorted "column=value" lines (so text-only columns such as a candidate's name count too).
/// </summary>
internal static class PointIdentity
{
    public static string PointId(string canonicalSpec, IEnumerable<KeyValuePair<string, object>> parameters) =>
        Hash(canonicalSpec + "--\n" + ParameterText(parameters));

    public static string ParameterText(IEnumerable<KeyValuePair<string, object>> parameters)
    {
        var sb = new StringBuilder();
        foreach (var (column, value) in parameters.OrderBy(p => p.Key, StringComparer.Ordinal))
        {
            sb.Append(column).Append('=').Append(Format(value)).Append('\n');
        }

        return sb.ToString();
    }

    public static string Format(object value) => value switch
    {
        double d => "d:" + CanonicalSpec.D(d),
        long l => "i:" + l.ToString(CultureInfo.InvariantCulture),
        bool b => b ? "b:true" : "b:false",
        string s => "s:" + CanonicalSpec.Quote(s),
        _ => "?:" + Convert.ToString(value, CultureInfo.InvariantCulture),
    };

    public static string Hash(string text) =>
        Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(text)))[..16];

    /// <summary>
    /// A point's id as the number its 16 hex digits spell (the first 8 bytes of the hash, big-endian):
    /// a plan keeps 8 bytes per point instead of a string, and <see cref="IdText"/> gives the id back.
    /// </summary>
    public static ulong PointKey(string canonicalSpec, IEnumerable<KeyValuePair<string, object>> parameters)
    {
        var text = canonicalSpec + "--\n" + ParameterText(parameters);
        var bytes = Encoding.UTF8.GetBytes(text);
        Span<byte> digest = stackalloc byte[32];
        SHA256.HashData(bytes, digest);
        return System.Buffers.Binary.BinaryPrimitives.ReadUInt64BigEndian(digest);
    }

    [ThreadStatic]
    private static CanonicalWriter? _writer;

    /// <summary>
    /// <see cref="PointKey(string, IEnumerable{KeyValuePair{string, object}})"/> of the point whose
    /// spec is <paramref name="spec"/>, for parameters whose identity names are already in ordinal
    /// order (the planner sorts them once per plan): the canonical text and the parameter lines are
    /// written as UTF-8 into one per-thread buffer and hashed there, with no string per point.
    /// </summary>
    public static ulong PointKey(BoundSpec spec, SolveOptions options, string[] sortedNames, object[] valuesInNameOrder)
    {
        var w = (_writer ??= new CanonicalWriter(2048, cacheNumbers: true)).Clear();
        CanonicalSpec.Write(w, spec, options).Append("--\n"u8);
        for (var i = 0; i < sortedNames.Length; i++)
        {
            w.Append(sortedNames[i]).Append('=');
            WriteFormatted(w, valuesInNameOrder[i]);
            w.Append('\n');
        }

        Span<byte> digest = stackalloc byte[32];
        SHA256.HashData(w.Written, digest);
        return System.Buffers.Binary.BinaryPrimitives.ReadUInt64BigEndian(digest);
    }

    /// <summary><see cref="Format"/> written to <paramref name="w"/> as UTF-8.</summary>
    private static void WriteFormatted(CanonicalWriter w, object value)
    {
        switch (value)
        {
            case double d:
                w.Append("d:"u8).D(d);
                break;
            case long l:
                w.Append("i:"u8).I(l);
                break;
            case bool b:
                w.Append(b ? "b:true"u8 : "b:false"u8);
                break;
            case string s:
                w.Append("s:"u8).Quote(s);
                break;
            default:
                w.Append(Format(value));
                break;
        }
    }

    /// <summary>The id text of a <see cref="PointKey"/>: 16 lower-case hex digits.</summary>
    public static string IdText(ulong key) => key.ToString("x16", CultureInfo.InvariantCulture);

    /// <summary>The id of <see cref="IdText"/> as its key; false when the text is not 16 hex digits.</summary>
    public static bool TryKey(string pointId, out ulong key) =>
        ulong.TryParse(pointId, NumberStyles.AllowHexSpecifier, CultureInfo.InvariantCulture, out key) && pointId.Length == 16;

    /// <summary>
    /// The same as <see cref="Hash(string, IEnumerable{string})"/> over the ids of <paramref name="keys"/>,
    /// without making a string per id.
    /// </summary>
    public static string Hash(string head, ReadOnlySpan<ulong> keys)
    {
        using var sha = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        sha.AppendData(Encoding.UTF8.GetBytes(head));
        const int perBlock = 1024;
        var buffer = new byte[perBlock * 17];
        var used = 0;
        for (var i = 0; i < keys.Length; i++)
        {
            if (i > 0)
            {
                buffer[used++] = (byte)'\n';
            }

            keys[i].TryFormat(buffer.AsSpan(used, 16), out _, "x16", CultureInfo.InvariantCulture);
            used += 16;
            if (used > buffer.Length - 17)
            {
                sha.AppendData(buffer, 0, used);
                used = 0;
            }
        }

        sha.AppendData(buffer, 0, used);
        return Convert.ToHexStringLower(sha.GetHashAndReset())[..16];
    }

    /// <summary>
    /// The same as <see cref="Hash(string)"/> of <paramref name="head"/> followed by the
    /// <paramref name="lines"/> joined with newlines, hashed as it goes (a million point ids are
    /// never joined into one string).
    /// </summary>
    public static string Hash(string head, IEnumerable<string> lines)
    {
        using var sha = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);
        sha.AppendData(Encoding.UTF8.GetBytes(head));
        var newline = "\n"u8.ToArray();
        var first = true;
        foreach (var line in lines)
        {
            if (!first)
            {
                sha.AppendData(newline);
            }

            sha.AppendData(Encoding.UTF8.GetBytes(line));
            first = false;
        }

        return Convert.ToHexStringLower(sha.GetHashAndReset())[..16];
    }
}
