namespace LatticeSweep.Worker.Output;

/// <summary>One column of a result table: its name (units in the name), type, unit text and meaning.</summary>
public sealed record ColumnDef(string Name, ColumnType Type, string Unit, string Description);
