namespace LatticeSweep.Worker.Output;

/// <summary>
/// A NaN reached a result table. Tables hold an undefined number as an empty (null) cell, never NaN,
/// so this is a defect in whatever produced the value; the part is not written.
/// </summary>
public sealed class NaNInTableException : InvalidOperationException
{
    public NaNInTableException(string table, string column, int row, string? pointId)
        : base($"{table}/ column {column}, row {row}{(pointId is null ? "" : $" (point {pointId})")}: NaN is not written; an undefined value must be an empty cell (a defect, please report it)")
    {
        Table = table;
        Column = column;
        Row = row;
        PointId = pointId;
    }

    public NaNInTableException()
        : base("NaN is not written to a result table")
    {
        Table = Column = "";
    }

    public NaNInTableException(string message)
        : base(message)
    {
        Table = Column = "";
    }

    public NaNInTableException(string message, Exception innerException)
        : base(message, innerException)
    {
        Table = Column = "";
    }

    public string Table { get; }
    public string Column { get; }
    public int Row { get; }
    public string? PointId { get; }
}
