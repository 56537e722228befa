using System.Globalization;
using Tomlyn.Model;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// Typed, located access to one TOML table of a job file. Every wrong type, out-of-range value
/// and unknown key becomes a <see cref="JobFileProblem"/> in the shared collector; getters then
/// return null so reading goes on and all problems are reported together.
/// </summary>
internal sealed class TableReader
{
    public TableReader(TomlDocument document, TomlTable table, string path, ProblemCollector problems, SourceLocation fallback)
    {
        Document = document;
        Table = table;
        Path = path;
        Problems = problems;
        var first = document.LocateTable(table);
        Location = first.IsKnown ? first : fallback;
    }

    public TomlDocument Document { get; }
    public TomlTable Table { get; }

    /// <summary>Dotted key path of this table, e.g. <c>model.sites[1]</c>; empty for the root.</summary>
    public string Path { get; }

    public ProblemCollector Problems { get; }

    /// <summary>Where the table starts (its first key), for problems of the table as a whole.</summary>
    public SourceLocation Location { get; }

    public bool Has(string key) => Table.ContainsKey(key);

    public string KeyPath(string key) => Path.Length == 0 ? key : Path + "." + key;

    public SourceLocation Where(string key)
    {
        var at = Document.Locate(Table, key);
        return at.IsKnown ? at : Location;
    }

    public void Error(string key, string message) => Problems.Add(Where(key), KeyPath(key), message);

    public void TableError(string message) => Problems.Add(Location, Path, message);

    /// <summary>Reports every key not in <paramref name="known"/>, with the nearest known key as a hint.</summary>
    public void RejectUnknown(params string[] known)
    {
        foreach (var key in Table.Keys)
        {
            if (!known.Contains(key, StringComparer.Ordinal))
            {
                Error(key, "unknown key; " + KeySuggestions.Hint(key, known));
            }
        }
    }

    public object? Raw(string key) => Table.TryGetValue(key, out var v) ? v : null;

    public string? String(string key, bool required = false, IReadOnlyCollection<string>? allowed = null)
    {
        if (!Fetch(key, required, out var value))
        {
            return null;
        }

        if (value is not string s)
        {
            Error(key, $"must be a string, got {Describe(value)}");
            return null;
        }

        if (allowed is not null && !allowed.Contains(s, StringComparer.Ordinal))
        {
            var hint = KeySuggestions.Nearest(s, allowed);
            Error(key, $"'{EchoText.Of(s)}' is not allowed; use one of: {string.Join(", ", allowed.Select(a => $"\"{a}\""))}" + (hint is null ? "" : $" (did you mean \"{hint}\"?)"));
            return null;
        }

        return s;
    }

    public bool? Bool(string key)
    {
        if (!Fetch(key, false, out var value))
        {
            return null;
        }

        if (value is not bool b)
        {
            Error(key, $"must be true or false, got {Describe(value)}");
            return null;
        }

        return b;
    }

    /// <summary>A finite number; <paramref name="check"/> returns what is wrong with it, or null.</summary>
    public double? Double(string key, bool required = false, Func<double, string?>? check = null)
    {
        if (!Fetch(key, required, out var value))
        {
            return null;
        }

        return ToDouble(value, key, check);
    }

    public long? Integer(string key, long min, long max, bool required = false)
    {
        if (!Fetch(key, required, out var value))
        {
            return null;
        }

        return ToInteger(value, key, min, max);
    }

    public TomlArray? Array(string key, bool required = false)
    {
        if (!Fetch(key, required, out var value))
        {
            return null;
        }

        if (value is not TomlArray a)
        {
            Error(key, $"must be an array, got {Describe(value)}");
            return null;
        }

        return a;
    }

    /// <summary>A list of finite numbers, each passing <paramref name="check"/>; a single number is accepted when <paramref name="allowScalar"/>.</summary>
    public IReadOnlyList<double>? DoubleList(string key, bool required = false, Func<double, string?>? check = null, bool allowScalar = false, int minCount = 1, int maxCount = int.MaxValue)
    {
        if (!Fetch(key, required, out var value))
        {
            return null;
        }

        if (allowScalar && value is long or double)
        {
            return ToDouble(value, key, check) is { } d ? [d] : null;
        }

        if (value is not TomlArray a)
        {
            Error(key, $"must be an array of numbers{(allowScalar ? " or a single number" : "")}, got {Describe(value)}");
            return null;
        }

        if (!CheckCount(key, a.Count, minCount, maxCount))
        {
            return null;
        }

        var list = new List<double>(a.Count);
        var ok = true;
        for (var i = 0; i < a.Count; i++)
        {
            var d = ToDouble(a[i], $"{key}[{i}]", check, key);
            ok &= d is not null;
            list.Add(d ?? 0);
        }

        return ok ? list : null;
    }

    public IReadOnlyList<long>? IntegerList(string key, long min, long max, bool required = false, bool allowScalar = false, int minCount = 1, int maxCount = int.MaxValue)
    {
        if (!Fetch(key, required, out var value))
        {
            return null;
        }

        if (allowScalar && value is long or double)
        {
            return ToInteger(value, key, min, max) is { } n ? [n] : null;
        }

        if (value is not TomlArray a)
        {
            Error(key, $"must be an array of whole numbers{(allowScalar ? " or a single whole number" : "")}, got {Describe(value)}");
            return null;
        }

        if (!CheckCount(key, a.Count, minCount, maxCount))
        {
            return null;
        }

        var list = new List<long>(a.Count);
        var ok = true;
        for (var i = 0; i < a.Count; i++)
        {
            var n = ToInteger(a[i], $"{key}[{i}]", min, max, key);
            ok &= n is not null;
            list.Add(n ?? 0);
        }

        return ok ? list : null;
    }

    /// <summary>An array of strings; with <paramref name="allowed"/>, each must be one of them (or of <paramref name="alsoAccepted"/>, former names not offered in the hint).</summary>
    public IReadOnlyList<string>? StringList(string key, IReadOnlyCollection<string>? allowed = null, IReadOnlyCollection<string>? alsoAccepted = null)
    {
        if (!Fetch(key, false, out var value))
        {
            return null;
        }

        if (value is not TomlArray a)
        {
            Error(key, $"must be an array of strings, got {Describe(value)}");
            return null;
        }

        var list = new List<string>(a.Count);
        var ok = true;
        for (var i = 0; i < a.Count; i++)
        {
            if (a[i] is not string s)
            {
                Problems.Add(Where(key), $"{KeyPath(key)}[{i}]", $"must be a string, got {Describe(a[i])}");
                ok = false;
            }
            else if (allowed is not null && !allowed.Contains(s, StringComparer.Ordinal) && alsoAccepted?.Contains(s, StringComparer.Ordinal) != true)
            {
                Problems.Add(Where(key), $"{KeyPath(key)}[{i}]", $"'{EchoText.Of(s)}' is not allowed; use any of: {string.Join(", ", allowed.Select(x => $"\"{x}\""))}");
                ok = false;
            }
            else
            {
                list.Add(s);
            }
        }

        return ok ? list : null;
    }

    public TableReader? SubTable(string key, bool required = false)
    {
        if (!Fetch(key, required, out var value))
        {
            return null;
        }

        if (value is not TomlTable t)
        {
            Error(key, $"must be a table, got {Describe(value)}");
            return null;
        }

        return new TableReader(Document, t, KeyPath(key), Problems, Where(key));
    }

    /// <summary>An array of tables, written either as <c>[[key]]</c> sections or as an inline array of <c>{ ... }</c>.</summary>
    public IReadOnlyList<TableReader> TableList(string key, bool required = false)
    {
        if (!Fetch(key, required, out var value))
        {
            return [];
        }

        var at = Where(key);
        var tables = new List<TomlTable>();
        switch (value)
        {
            case TomlTableArray ta:
                tables.AddRange(ta);
                break;
            case TomlArray a when a.All(x => x is TomlTable):
                tables.AddRange(a.Cast<TomlTable>());
                break;
            default:
                Error(key, $"must be a list of tables ([[{KeyPath(key)}]] sections or [{{ ... }}, ...]), got {Describe(value)}");
                return [];
        }

        return [.. tables.Select((t, i) => new TableReader(Document, t, $"{KeyPath(key)}[{i}]", Problems, at))];
    }

    /// <summary>Converts a raw TOML value (from this table) to a finite double, reporting problems at <paramref name="locateKey"/>.</summary>
    public double? ToDouble(object? value, string keyForMessage, Func<double, string?>? check = null, string? locateKey = null)
    {
        double d;
        switch (value)
        {
            case long l:
                d = l;
                break;
            case double x:
                d = x;
                break;
            default:
                Problems.Add(Where(locateKey ?? keyForMessage), KeyPath(keyForMessage), $"must be a number, got {Describe(value)}");
                return null;
        }

        if (!double.IsFinite(d))
        {
            Problems.Add(Where(locateKey ?? keyForMessage), KeyPath(keyForMessage), $"must be a finite number, got {Show(d)}");
            return null;
        }

        // Keys with a check are model, sample and output quantities; a range's ends (no check) only generate values,
        // and each generated value is checked as a field value (FieldValues), vanishingly small ones included.
        var problem = check is null ? null : check(d) ?? Checks.NotVanishinglySmall(d);
        if (problem is not null)
        {
            Problems.Add(Where(locateKey ?? keyForMessage), KeyPath(keyForMessage), problem);
            return null;
        }

        return d;
    }

    public long? ToInteger(object? value, string keyForMessage, long min, long max, string? locateKey = null)
    {
        var at = Where(locateKey ?? keyForMessage);
        long n;
        switch (value)
        {
            case long l:
                n = l;
                break;
            case double x when double.IsFinite(x) && Math.Floor(x) == x && Math.Abs(x) < 9e15:
                n = (long)x;
                break;
            default:
                Problems.Add(at, KeyPath(keyForMessage), $"must be a whole number, got {Describe(value)}");
                return null;
        }

        if (n < min || n > max)
        {
            Problems.Add(at, KeyPath(keyForMessage), $"must be in [{min.ToString(CultureInfo.InvariantCulture)}, {max.ToString(CultureInfo.InvariantCulture)}], got {n.ToString(CultureInfo.InvariantCulture)}");
            return null;
        }

        return n;
    }

    public static string Describe(object? value) => value switch
    {
        null => "nothing",
        string s => $"the string \"{EchoText.Of(s)}\"",
        long l => $"the whole number {l.ToString(CultureInfo.InvariantCulture)}",
        double d => $"the number {Show(d)}",
        bool b => b ? "true" : "false",
        TomlArray => "an array",
        TomlTable => "a table",
        TomlTableArray => "a list of tables",
        _ => "a " + value.GetType().Name,
    };

    public static string Show(double d) => d.ToString("G6", CultureInfo.InvariantCulture);

    private bool Fetch(string key, bool required, out object? value)
    {
        if (Table.TryGetValue(key, out value))
        {
            return true;
        }

        if (required)
        {
            Problems.Add(Location, KeyPath(key), "is required");
        }

        return false;
    }

    private bool CheckCount(string key, int count, int min, int max)
    {
        if (count < min || count > max)
        {
            var range = min == max ? $"exactly {min}" : max == int.MaxValue ? $"at least {min}" : $"{min} to {max}";
            Error(key, $"needs {range} value(s), got {count}");
            return false;
        }

        return true;
    }
}
