namespace LatticeSweep.Worker.Output;

/// <summary>The Parquet type of a result column. Every column is nullable (failed points leave numbers empty).</summary>
public enum ColumnType
{
    /// <summary>UTF-8 string.</summary>
    Text,

    /// <summary>64-bit float.</summary>
    Double,

    /// <summary>32-bit signed integer.</summary>
    Int32,

    /// <summary>64-bit signed integer.</summary>
    Int64,

    /// <summary>Boolean.</summary>
    Bool,

    /// <summary>UTC timestamp, millisecond resolution.</summary>
    Timestamp,
}
