using System.Globalization;
using System.Numerics;

namespace LatticeSweep.Engine.Numerics;

/// <summary>
/// The eigen-solver could not give a result: the input held NaN or Infinity, or the QL iteration
/// did not converge. A model that produces such a matrix fails its point with this message.
/// </summary>
public sealed class EigenSolverException : Exception
{
    public EigenSolverException()
        : base("The eigen-solver failed.")
    {
    }

    public EigenSolverException(string message)
        : base(message)
    {
    }

    public EigenSolverException(string message, Exception innerException)
        : base(message, innerException)
    {
    }

    private EigenSolverException(string message, int matrixOrder, int iterations, int? row, int? column)
        : base(message)
    {
        MatrixOrder = matrixOrder;
        Iterations = iterations;
        Row = row;
        Column = column;
    }

    /// <summary>Order n of the n x n matrix, or 0 when not known.</summary>
    public int MatrixOrder { get; }

    /// <summary>QL iterations spent before giving up (0 when the input was rejected).</summary>
    public int Iterations { get; }

    /// <summary>Zero-based row of the offending element, when the input was rejected.</summary>
    public int? Row { get; }

    /// <summary>Zero-based column of the offending element, when the input was rejected.</summary>
    public int? Column { get; }

    internal static EigenSolverException NonFinite(int n, int row, int column, Complex value) =>
        new(
            $"Element ({row}, {column}) (zero-based row, column) of the {n}x{n} matrix is not finite: " +
            $"{Format(value)}. The eigen-solver needs finite numbers.",
            n,
            0,
            row,
            column);

    internal static EigenSolverException NonFinite(int n, int row, int column, double value) =>
        new(
            $"Element ({row}, {column}) (zero-based row, column) of the {n}x{n} matrix is not finite: " +
            $"{Format(value)}. The eigen-solver needs finite numbers.",
            n,
            0,
            row,
            column);

    internal static EigenSolverException NotConverged(int n, int eigenvalueIndex, int iterationsOnIt, int totalIterations) =>
        new(
            $"The eigen-solver did not converge for a {n}x{n} matrix: eigenvalue {eigenvalueIndex} was still " +
            $"unresolved after {iterationsOnIt} QL iterations ({totalIterations} in total).",
            n,
            totalIterations,
            null,
            null);

    private static string Format(double value) => value.ToString("R", CultureInfo.InvariantCulture);

    private static string Format(Complex value) =>
        $"{Format(value.Real)} + {Format(value.Imaginary)}i";
}
