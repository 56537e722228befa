using System.Globalization;
using System.Text;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>
/// A growable UTF-8 buffer that writes the canonical text's pieces (text, numbers, quoted names)
/// without making a string per piece: the planner writes a point's whole id text into one reused
/// buffer and hashes its bytes. Every number is written exactly as <see cref="CanonicalSpec.D"/>
/// and <see cref="CanonicalSpec.I"/> write it (invariant culture, "R" for doubles), so the bytes
/// equal the UTF-8 of the string form.
/// </summary>
internal sealed class CanonicalWriter
{
    private const int CacheBits = 12;

    private readonly long[]? _cachedBits;
    private readonly byte[]?[]? _cachedText;
    private byte[] _bytes;
    private int _length;

    /// <param name="capacity">Bytes to start with (the buffer grows as needed).</param>
    /// <param name="cacheNumbers">Keep the text of the last ~4,000 distinct doubles written (~100 KB): for a writer reused for many points.</param>
    public CanonicalWriter(int capacity = 1024, bool cacheNumbers = false)
    {
        _bytes = new byte[Math.Max(64, capacity)];
        if (cacheNumbers)
        {
            _cachedBits = new long[1 << CacheBits];
            _cachedText = new byte[1 << CacheBits][];
        }
    }

    /// <summary>The bytes written so far.</summary>
    public ReadOnlySpan<byte> Written => _bytes.AsSpan(0, _length);

    public int Length => _length;

    public CanonicalWriter Clear()
    {
        _length = 0;
        return this;
    }

    /// <summary>Drops what was written after <paramref name="length"/> (a point's text after the shared part).</summary>
    public void Truncate(int length) => _length = length;

    public override string ToString() => Encoding.UTF8.GetString(Written);

    public CanonicalWriter Append(string s)
    {
        Ensure(Encoding.UTF8.GetMaxByteCount(s.Length));
        _length += Encoding.UTF8.GetBytes(s, _bytes.AsSpan(_length));
        return this;
    }

    /// <summary>UTF-8 text already encoded (literals such as <c>"--\n"u8</c>).</summary>
    public CanonicalWriter Append(scoped ReadOnlySpan<byte> utf8)
    {
        Ensure(utf8.Length);
        utf8.CopyTo(_bytes.AsSpan(_length));
        _length += utf8.Length;
        return this;
    }

    /// <summary>An ASCII character (the canonical text's separators).</summary>
    public CanonicalWriter Append(char c)
    {
        if (c > 0x7f)
        {
            return Append(c.ToString());
        }

        Ensure(1);
        _bytes[_length++] = (byte)c;
        return this;
    }

    /// <summary>An enum's name, as <see cref="StringBuilder.Append{T}"/> writes it.</summary>
    public CanonicalWriter Name<T>(T value)
        where T : struct, Enum => Append(value.ToString());

    /// <summary>Round-trip text of a double (<see cref="CanonicalSpec.D"/>), from this writer's cache of recent values when there.</summary>
    public CanonicalWriter D(double v)
    {
        // Formatting a double costs ~0.1-0.2 us, the rest of a point's text far less; a sweep writes
        // the same few hundred values (its template's and its axes') again and again.
        var bits = BitConverter.DoubleToInt64Bits(v);
        var slot = (int)((ulong)(bits * unchecked((long)0x9E3779B97F4A7C15)) >> (64 - CacheBits));
        if (_cachedText is not null && _cachedText[slot] is { } text && _cachedBits![slot] == bits)
        {
            return Append(text);
        }

        Ensure(32);
        if (!v.TryFormat(_bytes.AsSpan(_length), out var n, "R", CultureInfo.InvariantCulture))
        {
            return Append(CanonicalSpec.D(v));
        }

        if (_cachedText is not null)
        {
            _cachedBits![slot] = bits;
            _cachedText[slot] = _bytes.AsSpan(_length, n).ToArray();
        }

        _length += n;
        return this;
    }

    /// <summary>A double, or "-" when there is none.</summary>
    public CanonicalWriter D(double? v) => v is { } x ? D(x) : Append('-');

    public CanonicalWriter I(long v)
    {
        Ensure(24);
        v.TryFormat(_bytes.AsSpan(_length), out var n, default, CultureInfo.InvariantCulture);
        _length += n;
        return this;
    }

    /// <summary>A quoted name (<see cref="CanonicalSpec.Quote"/>).</summary>
    public CanonicalWriter Quote(string s)
    {
        if (s.AsSpan().IndexOfAny('\\', '"', '\n') >= 0)
        {
            return Append(CanonicalSpec.Quote(s));
        }

        return Append('"').Append(s).Append('"');
    }

    /// <summary>A quoted name, or "-" when there is none.</summary>
    public CanonicalWriter QuoteOrDash(string? s) => s is null ? Append('-') : Quote(s);

    public CanonicalWriter V(Vec3 v) => Append('(').D(v.X).Append(',').D(v.Y).Append(',').D(v.Z).Append(')');

    public CanonicalWriter Flag(bool b) => Append(b ? '1' : '0');

    private void Ensure(int more)
    {
        if (_length + more > _bytes.Length)
        {
            Array.Resize(ref _bytes, Math.Max(_bytes.Length * 2, _length + more));
        }
    }
}
