using System.Globalization;
using LatticeSweep.Worker.JobFiles;

namespace LatticeSweep.Worker.Planning.Fields;

/// <summary>Turns a raw value (TOML number or string, CSV text, Parquet cell) into a field's type and checks it.</summary>
internal static class FieldValues
{
    /// <summary>The value as double, long or string; or null with <paramref name="error"/> saying what is wrong.</summary>
    public static object? Coerce(SweepField field, object? raw, out string? error)
    {
        error = null;
        object? value = field.ValueType switch
        {
            AxisValueType.Double => ToDouble(raw),
            AxisValueType.Integer => ToInteger(raw),
            _ => raw is string s ? s : null,
        };
        if (value is null)
        {
            var expected = field.ValueType switch
            {
                AxisValueType.Double => "a finite number",
                AxisValueType.Integer => "a whole number",
                _ => "a string",
            };
            error = $"{field.Path} takes {expected}, got {Describe(raw)}";
            return null;
        }

        var problem = field.Check(value) ?? (value is double d ? Checks.NotVanishinglySmall(d) : null);
        if (problem is not null)
        {
            error = $"{field.Path} {problem}";
            return null;
        }

        return value;
    }

    private static object? ToDouble(object? raw) => raw switch
    {
        long l => (double)l,
        double d when double.IsFinite(d) => d,
        string s when double.TryParse(s, NumberStyles.Float, CultureInfo.InvariantCulture, out var d) && double.IsFinite(d) => d,
        _ => null,
    };

    private static object? ToInteger(object? raw) => raw switch
    {
        long l => l,
        double d when double.IsFinite(d) && Math.Floor(d) == d && Math.Abs(d) < 9e15 => (long)d,
        string s when long.TryParse(s, NumberStyles.Integer, CultureInfo.InvariantCulture, out var l) => l,
        _ => null,
    };

    private static string Describe(object? raw) => raw is string s ? $"\"{s}\"" : TableReader.Describe(raw);
}
