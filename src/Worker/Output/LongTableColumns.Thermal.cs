using LatticeSweep.Engine.Results;

namespace LatticeSweep.Worker.Output;

/// <summary>thermal/ built straight into its column arrays (see <see cref="LongTableColumns"/> for why).</summary>
internal static partial class LongTableColumns
{
    /// <summary>
    /// thermal/: each point's rows in the order of the temperatures asked for, with the values
    /// <see cref="ChunkTables.ThermalAt"/> puts beside each (the same as the row path's, whose column
    /// formulas in <see cref="ResultSchemas"/> these loops repeat; tests hold both equal cell by cell).
    /// </summary>
    public static TableRows? Thermal(TableSpec<RowOf<ThermalValue>> spec, IReadOnlyList<PointOutcome> points)
    {
        var starts = RowStarts(points, result => result.Thermal.Length);

        var total = starts[^1];
        var own = new Dictionary<string, Array>(StringComparer.Ordinal);
        double?[] Column(string name) => (double?[])(own[name] = new double?[total]);
        bool?[] Flag(string name) => (bool?[])(own[name] = new bool?[total]);
        var temperature = Column("temperature_k");
        var energyMol = Column("internal_energy_j_per_mol");
        var freeMol = Column("free_energy_j_per_mol");
        var entropyMol = Column("entropy_j_per_mol_k");
        var cvMol = Column("cv_j_per_mol_k");
        var debye = Column("debye_temperature_k");
        var energyCell = Column("internal_energy_j_per_cell");
        var freeCell = Column("free_energy_j_per_cell");
        var entropyCell = Column("entropy_j_per_cell_k");
        var cvCell = Column("cv_j_per_cell_k");
        var energyKg = Column("internal_energy_j_per_kg");
        var freeKg = Column("free_energy_j_per_kg");
        var entropyKg = Column("entropy_j_per_kg_k");
        var cvKg = Column("cv_j_per_kg_k");
        var kappaXx = Column("kappa_xx_w_per_m_k");
        var kappaYy = Column("kappa_yy_w_per_m_k");
        var kappaZz = Column("kappa_zz_w_per_m_k");
        var kappa = Column("kappa_w_per_m_k");
        var meshChange = Column("kappa_mesh_change");
        var meshChangeLowerBound = Flag("kappa_mesh_change_lower_bound");
        var energyChange = Column("internal_energy_mesh_change_j_per_mol");
        var freeChange = Column("free_energy_mesh_change_j_per_mol");
        var entropyChange = Column("entropy_mesh_change_j_per_mol_k");
        var cvChange = Column("cv_mesh_change_j_per_mol_k");
        var msdChange = Column("msd_mesh_change_nm2");
        var periodicCv = Column("periodic_cv_j_per_mol_k");
        var cvRatio = Column("cv_ratio_to_periodic");
        var energyError = Column("internal_energy_stderr_j_per_mol");
        var freeError = Column("free_energy_stderr_j_per_mol");
        var entropyError = Column("entropy_stderr_j_per_mol_k");
        var cvError = Column("cv_stderr_j_per_mol_k");
        var orderedCv = Column("ordered_cv_j_per_mol_k");
        var kappaConfined = Column("kappa_confined_w_per_m_k");

        for (var p = 0; p < points.Count; p++)
        {
            var result = points[p].Result!;
            var perCell = ThermalScale.PerCellFactor(result.Summary.SitesPerCell);
            var perKg = ThermalScale.PerKgFactor(result.Summary.MolarMassKgPerMol);
            var row = starts[p];
            for (var i = 0; i < result.Thermal.Length; i++, row++)
            {
                var v = ChunkTables.ThermalAt(result, i);
                var t = v.Thermal;
                temperature[row] = t.TemperatureK;
                energyMol[row] = t.InternalEnergyJPerMol;
                freeMol[row] = t.FreeEnergyJPerMol;
                entropyMol[row] = t.EntropyJPerMolK;
                cvMol[row] = t.HeatCapacityJPerMolK;
                debye[row] = t.DebyeTemperatureK;
                energyCell[row] = t.InternalEnergyJPerMol * perCell;
                freeCell[row] = t.FreeEnergyJPerMol * perCell;
                entropyCell[row] = t.EntropyJPerMolK * perCell;
                cvCell[row] = t.HeatCapacityJPerMolK * perCell;
                energyKg[row] = t.InternalEnergyJPerMol * perKg;
                freeKg[row] = t.FreeEnergyJPerMol * perKg;
                entropyKg[row] = t.EntropyJPerMolK * perKg;
                cvKg[row] = t.HeatCapacityJPerMolK * perKg;
                if (v.Conductivity is { } k)
                {
                    kappaXx[row] = ResultSchemas.NullIfNaN(k.KappaXxWPerMK);
                    kappaYy[row] = ResultSchemas.NullIfNaN(k.KappaYyWPerMK);
                    kappaZz[row] = ResultSchemas.NullIfNaN(k.KappaZzWPerMK);
                    kappa[row] = ResultSchemas.NullIfNaN(k.KappaWPerMK);
                    meshChange[row] = ResultSchemas.NullIfNaN(k.MeshRelativeChange);
                    meshChangeLowerBound[row] = double.IsNaN(k.MeshRelativeChange) ? null : k.MeshChangeIsLowerBound;
                }

                if (v.MeshChange is { } c)
                {
                    energyChange[row] = ResultSchemas.NullIfNaN(c.InternalEnergyJPerMol);
                    freeChange[row] = ResultSchemas.NullIfNaN(c.FreeEnergyJPerMol);
                    entropyChange[row] = ResultSchemas.NullIfNaN(c.EntropyJPerMolK);
                    cvChange[row] = ResultSchemas.NullIfNaN(c.HeatCapacityJPerMolK);
                }

                msdChange[row] = ResultSchemas.NullIfNaN(v.MsdMeshChangeNm2);
                periodicCv[row] = v.PeriodicCvJPerMolK;
                cvRatio[row] = v.PeriodicCvJPerMolK is { } periodic && periodic > 0 && double.IsFinite(t.HeatCapacityJPerMolK) ? t.HeatCapacityJPerMolK / periodic : null;
                if (v.StandardErrors is { } e)
                {
                    energyError[row] = ResultSchemas.NullIfNaN(e.InternalEnergyJPerMol);
                    freeError[row] = ResultSchemas.NullIfNaN(e.FreeEnergyJPerMol);
                    entropyError[row] = ResultSchemas.NullIfNaN(e.EntropyJPerMolK);
                    cvError[row] = ResultSchemas.NullIfNaN(e.HeatCapacityJPerMolK);
                }

                orderedCv[row] = ResultSchemas.NullIfNaN(v.OrderedCvJPerMolK);
                kappaConfined[row] = ResultSchemas.NullIfNaN(v.Confined?.KappaWPerMK);
            }
        }

        return Assemble(spec, points, starts, name => own.GetValueOrDefault(name));
    }
}
