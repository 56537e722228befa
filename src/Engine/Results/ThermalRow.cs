namespace LatticeSweep.Engine.Results;

/// <summary>
/// Thermal functions at one temperature, per mole of atoms. Zero-frequency rigid translations are
/// excluded. <see cref="DebyeTemperatureK"/> is the Debye temperature whose Debye heat capacity
/// equals this Cv (null where undefined, e.g. T = 0 or Cv at the classical limit). An unstable model
/// has no thermal rows.
/// </summary>
public sealed record ThermalRow(
    double TemperatureK,
    double InternalEnergyJPerMol,
    double FreeEnergyJPerMol,
    double EntropyJPerMolK,
    double HeatCapacityJPerMolK,
    double? DebyeTemperatureK);
