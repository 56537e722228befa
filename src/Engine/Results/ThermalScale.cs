namespace LatticeSweep.Engine.Results;

/// <summary>Factors from per mole of atoms to per cell and per kg.</summary>
public static class ThermalScale
{
    /// <summary>Multiply a per-mole-of-atoms value by this to get it per primitive cell (r atoms).</summary>
    public static double PerCellFactor(int sitesPerCell) => sitesPerCell / Units.PhysicalConstants.AvogadroPerMol;

    /// <summary>Multiply a per-mole-of-atoms value by this to get it per kg.</summary>
    public static double PerKgFactor(double molarMassKgPerMol) => 1.0 / molarMassKgPerMol;
}
