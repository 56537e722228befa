using System.Globalization;

namespace LatticeSweep.Engine.Errors;

/// <summary>Small guards that turn a bad number into a located <see cref="ModelException"/>.</summary>
public static class Guard
{
    public static void PositiveFinite(double value, string where, string what)
    {
        if (!double.IsFinite(value))
        {
            throw Single(ModelProblemKind.NonFinite, where, $"{what} must be a finite number, got {Show(value)}");
        }

        if (value <= 0)
        {
            throw Single(ModelProblemKind.OutOfRange, where, $"{what} must be > 0, got {Show(value)}");
        }
    }

    public static void Finite(double value, string where, string what)
    {
        if (!double.IsFinite(value))
        {
            throw Single(ModelProblemKind.NonFinite, where, $"{what} must be a finite number, got {Show(value)}");
        }
    }

    public static void InRange(int value, int min, int max, string where, string what)
    {
        if (value < min || value > max)
        {
            throw Single(ModelProblemKind.OutOfRange, where, $"{what} must be in [{min}, {max}], got {value}");
        }
    }

    public static ModelException Single(ModelProblemKind kind, string where, string message) =>
        new([new ModelProblem(kind, where, message)]);

    public static string Show(double value) => value.ToString("G6", CultureInfo.InvariantCulture);
}
