namespace LatticeSweep.Engine.QuasiHarmonic;

/// <summary>
/// One harmonic solve of the quasi-harmonic loop: the lattice scale, the cell measure V (m, m^2
/// or m^3), and per temperature the vibrational free energy, entropy and heat capacity per cell
/// (J, J/K); <see cref="Usable"/> is false for an unstable or unsolvable volume. A bulk mesh's volume
/// also carries <see cref="MeshSums"/>, the plain sums over its modes, smooth in V (null for a finite crystal,
/// whose F_vib is such a sum already).
/// </summary>
internal sealed record VolumeSample(double Scale, double CellMeasure, double[] FreeEnergyJ, double[] EntropyJPerK, double[] HeatCapacityJPerK, bool Usable)
{
    public Solving.MeshModeSums? MeshSums { get; init; }
}
