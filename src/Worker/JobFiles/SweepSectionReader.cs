using System.Collections.Immutable;
using Tomlyn.Model;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>Reads <c>[sweep]</c>: name, description, seed, limits, how axes combine, the axes and a candidates table.</summary>
internal static class SweepSectionReader
{
    public const long DefaultMaxPoints = 100_000;
    public const long HardMaxPoints = 10_000_000;
    public const int MaxNameLength = 100;
    public const int MaxValuesPerAxis = 1_000_000;

    private static readonly string[] Keys = ["name", "description", "seed", "max_points", "combine", "count", "axes", "candidates", "warn_point_time_s"];

    /// <summary>Default of <c>warn_point_time_s</c>: <c>check</c> warns about points estimated to take longer (one hour).</summary>
    public const double DefaultWarnPointTimeS = 3600;
    private static readonly string[] AxisKeys = ["path", "values", "range", "random"];
    private static readonly string[] RangeKeys = ["from", "to", "steps", "scale"];
    private static readonly string[] RandomKeys = ["from", "to", "count", "scale"];
    private static readonly string[] CandidateKeys = ["file", "columns", "keep"];

    private static readonly Dictionary<string, CombineMode> Combines = new(StringComparer.Ordinal)
    {
        ["grid"] = CombineMode.Grid,
        ["zip"] = CombineMode.Zip,
        ["latin_hypercube"] = CombineMode.LatinHypercube,
        ["random"] = CombineMode.Random,
    };

    public static SweepDeclaration Read(TableReader? t, string jobFilePath)
    {
        var stem = Path.GetFileNameWithoutExtension(jobFilePath);
        if (t is null)
        {
            return new SweepDeclaration(stem, "", 1, DefaultMaxPoints, CombineMode.Grid, null, [], null, DefaultWarnPointTimeS);
        }

        t.RejectUnknown(Keys);
        var name = t.String("name") ?? stem;
        if (CheckName(name) is { } bad)
        {
            if (t.Has("name"))
            {
                t.Error("name", bad);
            }
            else
            {
                t.Problems.Add(t.Location, "sweep.name", $"the file name '{EchoText.Of(stem)}' cannot name the sweep ({bad}); give [sweep] name");
            }
        }

        var description = t.String("description") ?? "";
        var seed = t.Integer("seed", 0, long.MaxValue) ?? 1;
        var maxPoints = t.Integer("max_points", 1, HardMaxPoints) ?? DefaultMaxPoints;
        var combine = t.String("combine", allowed: [.. Combines.Keys]) is { } c ? Combines[c] : CombineMode.Grid;
        var sampling = combine is CombineMode.LatinHypercube or CombineMode.Random;
        int? count = null;
        if (sampling)
        {
            count = (int?)t.Integer("count", 1, HardMaxPoints, required: true);
        }
        else if (t.Has("count"))
        {
            t.Error("count", "only used with combine = \"latin_hypercube\" or \"random\"");
        }

        var axes = t.TableList("axes").Select(a => ReadAxis(a, sampling)).OfType<AxisDeclaration>().ToImmutableArray();
        var candidates = ReadCandidates(t.SubTable("candidates"), jobFilePath);
        var warnPointTime = t.Double("warn_point_time_s", check: v => v > 0 && v <= 1e9 ? null : $"must be a number of seconds from 0 (exclusive) to 1e9, got {TableReader.Show(v)}") ?? DefaultWarnPointTimeS;
        return new SweepDeclaration(name, description, (ulong)seed, maxPoints, combine, count, axes, candidates, warnPointTime);
    }

    /// <summary>A sweep name becomes a folder under the output root: it must not be able to leave it.</summary>
    public static string? CheckName(string name)
    {
        if (name.Length == 0)
        {
            return "must not be empty";
        }

        if (name.Length > MaxNameLength)
        {
            return $"must be at most {MaxNameLength} characters";
        }

        if (name.Any(ch => !(char.IsAsciiLetterOrDigit(ch) || ch is '.' or '_' or '-')))
        {
            return $"'{EchoText.Of(name)}' may use only letters A-Z a-z, digits, '.', '_' and '-' (it names a folder under the output root)";
        }

        if (name.Contains("..", StringComparison.Ordinal) || name.All(ch => ch == '.'))
        {
            return $"'{EchoText.Of(name)}' must not contain '..' or consist of dots (it would leave the output root)";
        }

        return null;
    }

    private static AxisDeclaration? ReadAxis(TableReader a, bool sampling)
    {
        a.RejectUnknown(AxisKeys);
        var path = a.String("path", required: true);
        var given = new[] { "values", "range", "random" }.Where(a.Has).ToList();
        if (given.Count != 1)
        {
            a.TableError(given.Count == 0
                ? "give the axis values as values = [...], range = { from, to, steps, scale } or random = { from, to, count, scale }"
                : $"give only one of values, range or random (found {string.Join(", ", given)})");
            return null;
        }

        AxisSource? source = given[0] switch
        {
            "values" => ReadValues(a),
            "range" => ReadRange(a.SubTable("range"), sampling),
            _ => ReadRandom(a, sampling),
        };
        return path is null || source is null ? null : new AxisDeclaration(path, a, source);
    }

    private static ValueListSource? ReadValues(TableReader a)
    {
        var array = a.Array("values");
        if (array is null)
        {
            return null;
        }

        if (array.Count == 0 || array.Count > MaxValuesPerAxis)
        {
            a.Error("values", $"needs 1 to {MaxValuesPerAxis} values, got {array.Count}");
            return null;
        }

        var values = new List<object>(array.Count);
        for (var i = 0; i < array.Count; i++)
        {
            if (array[i] is long or double or string or bool)
            {
                values.Add(array[i]!);
            }
            else
            {
                a.Problems.Add(a.Where("values"), $"{a.KeyPath("values")}[{i}]", $"must be a number or a string, got {TableReader.Describe(array[i])}");
                return null;
            }
        }

        return new ValueListSource([.. values]);
    }

    private static RangeSource? ReadRange(TableReader? r, bool sampling)
    {
        if (r is null)
        {
            return null;
        }

        r.RejectUnknown(RangeKeys);
        var (from, to, log) = ReadInterval(r);
        int? steps = null;
        if (sampling)
        {
            if (r.Has("steps"))
            {
                r.Error("steps", "under a sampling combine the range is an interval; the number of points is [sweep] count");
            }
        }
        else
        {
            steps = (int?)r.Integer("steps", 1, MaxValuesPerAxis, required: true);
        }

        return from is null || to is null || (!sampling && steps is null) ? null : new RangeSource(from.Value, to.Value, steps, log);
    }

    private static RandomSource? ReadRandom(TableReader a, bool sampling)
    {
        if (sampling)
        {
            a.Error("random", "with combine = \"latin_hypercube\" or \"random\" give each axis as range = { from, to, scale }; [sweep] count sets the number of points");
            return null;
        }

        var r = a.SubTable("random");
        if (r is null)
        {
            return null;
        }

        r.RejectUnknown(RandomKeys);
        var (from, to, log) = ReadInterval(r);
        var count = r.Integer("count", 1, MaxValuesPerAxis, required: true);
        return from is null || to is null || count is null ? null : new RandomSource(from.Value, to.Value, (int)count.Value, log);
    }

    private static (double? From, double? To, bool Log) ReadInterval(TableReader r)
    {
        var from = r.Double("from", required: true);
        var to = r.Double("to", required: true);
        var log = (r.String("scale", allowed: ["linear", "log"]) ?? "linear") == "log";
        if (from is not null && to is not null)
        {
            if (to < from)
            {
                r.Error("to", $"must be >= from ({TableReader.Show(from.Value)})");
                return (null, null, log);
            }

            if (log && from <= 0)
            {
                r.Error("from", "a log scale needs from > 0");
                return (null, null, log);
            }
        }

        return (from, to, log);
    }

    private static CandidatesDeclaration? ReadCandidates(TableReader? c, string jobFilePath)
    {
        if (c is null)
        {
            return null;
        }

        c.RejectUnknown(CandidateKeys);
        var file = c.String("file", required: true);
        var columns = c.SubTable("columns", required: true);
        var mapping = new List<KeyValuePair<string, string>>();
        if (columns is not null)
        {
            foreach (var key in columns.Table.Keys)
            {
                if (columns.String(key) is { } path)
                {
                    mapping.Add(new(key, path));
                }
            }

            if (columns.Table.Count == 0)
            {
                c.Error("columns", "map at least one column to a field path, e.g. columns = { \"mass_a\" = \"model.sites.A.mass_amu\" }");
            }
        }

        var keep = c.StringList("keep") ?? [];
        if (file is null || columns is null)
        {
            return null;
        }

        var full = Path.IsPathRooted(file) ? file : Path.Combine(Path.GetDirectoryName(Path.GetFullPath(jobFilePath)) ?? ".", file);
        return new CandidatesDeclaration(full, c, [.. mapping], [.. keep]);
    }
}
