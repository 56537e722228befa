using System.Globalization;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Results;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;

namespace LatticeSweep.Worker.Commands;

/// <summary>
/// <c>latsweep solve FILE</c>: solves one model at once (the first point of the sweep, which is the
/// unswept model when there are no axes) and prints its summary as a table with units.
/// Exit codes: 0 solved, 2 bad input, 3 the model cannot be solved (with the reason), 4 the model
/// is unstable (its worst wave vector and most negative frequency are printed, no thermal numbers).
/// </summary>
public static class SolveCommand
{
    public static int Run(string jobFile, TextWriter stdout, TextWriter stderr) => Run(jobFile, stdout, stderr, fullPrecision: false);

    /// <summary>As above; <paramref name="fullPrecision"/> prints every number with all its digits (round-trip text).</summary>
    public static int Run(string jobFile, TextWriter stdout, TextWriter stderr, bool fullPrecision)
    {
        ArgumentNullException.ThrowIfNull(stdout);
        ArgumentNullException.ThrowIfNull(stderr);
        SweepPlan plan;
        try
        {
            plan = JobFileLoader.Load(jobFile);
        }
        catch (JobFileException e)
        {
            return Cli.BadInputReport.Write(stderr, e.Message, escaped: true);
        }

        var point = plan.Points[0];
        PointResult result;
        try
        {
            var request = PointBinder.Bind(plan, point);
            result = PhononSolver.Solve(request.Model, request.Sample, request.Options);
        }
        catch (ModelException e)
        {
            stderr.WriteLine($"{jobFile}: the model cannot be solved:");
            stderr.WriteLine(e.Message);
            return 3;
        }

        stdout.WriteLine($"Sweep  {plan.SweepName}");
        stdout.WriteLine(plan.Points.Length > 1
            ? $"Point  {point.PointId}, the first of {plan.Points.Length} ({Parameters(point)})"
            : $"Point  {point.PointId}" + (point.Parameters.Count > 0 ? $" ({Parameters(point)})" : ""));
        stdout.WriteLine();
        var table = SummaryTable(result.Summary, result.ElasticFit, fullPrecision);
        AddInteractions(table, result, fullPrecision);
        table.WriteTo(stdout);
        if (result.Expansion?.AtReference.Breakdown is { } breakdown)
        {
            // Below the table: a sentence in the value column would widen every row.
            stdout.WriteLine();
            stdout.WriteLine($"Quasi-harmonic state at the reference temperature: {breakdown}.");
        }

        if (result.Surface is { } surface)
        {
            stdout.WriteLine();
            SurfaceTable(surface, result.Summary, fullPrecision, result.Errors, result.Ordered?.Summary).WriteTo(stdout);
        }

        if (!result.Summary.Stable)
        {
            stdout.WriteLine();
            stdout.WriteLine($"The model is unstable ({Queue.Instability.Where(result.Summary)}): its thermal numbers, sound speeds, band gaps and Debye temperatures mean nothing and are not shown.");
            return Cli.ExitCodes.SomeUnstable;
        }

        stdout.WriteLine();
        stdout.WriteLine(EstimateNote.Line);
        return 0;
    }

    /// <summary>What a sample with boundaries, a shape or disorder adds to the summary.</summary>
    internal static TextTable SurfaceTable(SurfaceResult f, PointSummary s, bool fullPrecision = false, StatisticalErrors? errors = null, PointSummary? ordered = null)
    {
        string N(double? v) => v is { } x && !double.IsNaN(x) ? x.ToString(fullPrecision ? "R" : "G6", CultureInfo.InvariantCulture) : "n/a";
        var t = new TextTable(["quantity", "value", "unit"], [false, true, false]);
        t.Add("boundaries", f.Boundaries, "");
        t.Add("shape", f.Shape, "");
        t.Add("solver", f.Method, "");
        t.Add("atoms", I(f.AtomCount), "");
        t.Add("surface / interior atoms", $"{I(f.SurfaceSites)} / {I(f.InteriorSites)}", "");
        t.Add("rigid-body modes excluded (of them rotations)", $"{I(s.RigidModesExcluded)} ({I(f.RigidRotations)})", "");
        t.Add("rotation defect", N(f.RotationDefectThz), "THz");
        t.Add("confinement gap", N(f.ConfinementGapThz), "THz");
        t.Add("surface-mode fraction", N(f.SurfaceModeFraction), "");
        t.Add("mean-square displacement, surface", N(f.MsdSurfaceNm2), "nm^2");
        t.Add("mean-square displacement, interior", N(f.MsdInteriorNm2), "nm^2");
        t.Add($"Cv of the periodic crystal ({f.PeriodicCells})", N(f.PeriodicCvAtReferenceJPerMolK), "J/(mol K)");
        t.Add("Cv ratio to periodic", N(f.PeriodicCvAtReferenceJPerMolK is { } p && p > 0 && s.HeatCapacityJPerMolK is { } cv ? cv / p : null), "");
        if (f.KpmMoments is { } moments)
        {
            t.Add("kernel polynomial moments / random vectors", $"{I(moments)} / {I(f.KpmRandomVectors ?? 0)}", "");
            t.Add("kernel polynomial resolution near 0", N(f.KpmResolutionThz), "THz");
        }

        if (errors is not null)
        {
            // Averages over random vectors or configurations: their spread, so a reader sees what the digits above are worth.
            t.Add($"standard errors over {I(errors.Samples)} {errors.Source}", "", "");
            t.Add("  of Cv", N(errors.HeatCapacityJPerMolK), "J/(mol K)");
            t.Add("  of entropy", N(errors.EntropyJPerMolK), "J/(mol K)");
            t.Add("  of free energy", N(errors.FreeEnergyJPerMol), "J/mol");
        }

        if (ordered is not null)
        {
            t.Add("Cv of the ordered virtual crystal", N(ordered.HeatCapacityJPerMolK), "J/(mol K)");
        }

        return t;
    }

    /// <summary>Long-wave elastic constants, the static lattice of potentials, a bond-bending fit and the quasi-harmonic state, where the point has them.</summary>
    internal static void AddInteractions(TextTable t, PointResult result, bool fullPrecision = false)
    {
        var s = result.Summary;
        string D(double v) => v.ToString(fullPrecision ? "R" : "G6", CultureInfo.InvariantCulture);
        string N(double? v) => v is { } x && !double.IsNaN(x) ? D(x) : "n/a";
        if (s.LatticeConstantNm is { } a)
        {
            t.Add("lattice constant", D(a), "nm");
        }

        if (s.ElasticConstants is { } c)
        {
            t.Add("C11, C12, C44 (long waves)", $"{D(c.C11Gpa)}, {D(c.C12Gpa)}, {D(c.C44Gpa)}", "GPa");
        }

        if (result.ElasticFit is { BendNPerM: { } bend } fit)
        {
            t.Add("fitted bond stretch, bend", $"{D(fit.NearestNPerM)}, {D(bend)}", "N/m");
        }

        if (s.StaticLattice is { } st)
        {
            t.Add("static energy per atom", D(st.EnergyEvPerAtom), "eV");
            t.Add("static pressure", N(st.PressureGpa), "GPa");
            t.Add("static minimum: lattice constant", D(st.EquilibriumLatticeConstantNm), "nm");
            t.Add("static minimum: energy per atom", D(st.EquilibriumEnergyEvPerAtom), "eV");
            t.Add("static minimum: bulk modulus", N(st.EquilibriumBulkModulusGpa), "GPa");
        }

        if (result.Expansion?.AtReference is { } x)
        {
            if (x.Breakdown is not null)
            {
                t.Add("quasi-harmonic at reference T", "none (see below)", "");
            }
            else
            {
                t.Add("lattice constant at reference T", N(x.LatticeConstantNm), "nm");
                t.Add("linear expansion coefficient", N(x.LinearExpansionPerK), "1/K");
                t.Add("isothermal bulk modulus", x.IsothermalBulkModulusGpa is { } g ? D(g) : N(x.IsothermalBulkModulusNPerM ?? x.IsothermalBulkModulusN),
                    x.IsothermalBulkModulusGpa is not null ? "GPa" : x.IsothermalBulkModulusNPerM is not null ? "N/m" : "N");
                t.Add("heat capacity Cp", N(x.CpJPerMolK), "J/(mol K)");
                t.Add("Grueneisen parameter (thermal)", N(x.Grueneisen), "");
            }
        }

        if (result.Conductivity?.GrueneisenSource is { } source)
        {
            t.Add("Grueneisen parameter used for kappa", $"{N(result.Conductivity.GrueneisenParameter)} ({source})", "");
        }
    }

    internal static TextTable SummaryTable(PointSummary s, Engine.Elastic.ElasticFitResult? fit = null, bool fullPrecision = false)
    {
        // 6 significant digits, or every digit (the shortest round-trip text) when asked.
        string D(double? v) => v is not { } x || double.IsNaN(x) ? "n/a" : x.ToString(fullPrecision ? "R" : "G6", CultureInfo.InvariantCulture);

        var t = new TextTable(["quantity", "value", "unit"], [false, true, false]);
        t.Add("dimension", I(s.Dimension), "");
        t.Add("sites per cell", I(s.SitesPerCell), "");
        t.Add("branches", I(s.BranchCount), "");
        t.Add("sample", s.SampleKind, "");
        t.Add(s.SampleKind == "finite" ? "cells" : "mesh wave vectors", I(s.CellsOrMeshPoints), "");
        t.Add("wave vectors solved", I(s.QPointsSolved), "");
        t.Add("modes", I(s.ModeCount), "");
        t.Add("rigid modes excluded", I(s.RigidModesExcluded), "");
        t.Add("zero modes excluded (all)", I(Output.ZeroModes.Total(s)), "");
        if (Output.ZeroModes.Floppy(s))
        {
            t.Add("floppy", $"YES: {I(Output.ZeroModes.BeyondRigid(s))} zero modes beyond the rigid ones", "");
        }

        if (fit is not null)
        {
            t.Add("elastic fit residual (relative)", D(fit.RelativeResidual), "");
            t.Add("C11, C12, C44 given", $"{D(fit.Given.C11Gpa)}, {D(fit.Given.C12Gpa)}, {D(fit.Given.C44Gpa)}", "GPa");
            t.Add("C11, C12, C44 of the springs", $"{D(fit.Reproduced.C11Gpa)}, {D(fit.Reproduced.C12Gpa)}, {D(fit.Reproduced.C44Gpa)}", "GPa");
            foreach (var speed in fit.SoundSpeeds)
            {
                t.Add($"Christoffel speeds {speed.Direction}", string.Join(", ", speed.SpeedsMPerS.Select(v => D(v))), "m/s");
            }

            foreach (var speed in fit.GivenSoundSpeeds)
            {
                t.Add($"Christoffel speeds {speed.Direction}, given C", string.Join(", ", speed.SpeedsMPerS.Select(v => D(v))), "m/s");
            }
        }

        t.Add("stable", s.Stable ? "yes" : "NO", "");
        if (s.WorstQReduced is { } q)
        {
            t.Add("worst wave vector (reduced)", q.ToString(), "");
        }

        t.Add("highest frequency", D(s.MaxFrequencyThz), "THz");
        t.Add(s.Stable ? "lowest frequency" : "most negative frequency (imaginary mode)", D(s.MinFrequencyThz), "THz");
        if (!s.Stable)
        {
            return t;
        }

        foreach (var gap in s.Gaps)
        {
            t.Add("band gap", $"{D(gap.LowerThz)} - {D(gap.UpperThz)}", "THz");
        }

        foreach (var speed in s.SoundSpeeds)
        {
            t.Add($"sound speeds {speed.Direction}", string.Join(", ", speed.SpeedsMPerS.Select(v => D(v))), "m/s");
        }

        t.Add("reference temperature", D(s.ReferenceTemperatureK), "K");
        t.Add("heat capacity Cv", D(s.HeatCapacityJPerMolK), "J/(mol K)");
        t.Add("entropy S", D(s.EntropyJPerMolK), "J/(mol K)");
        t.Add("free energy F", D(s.FreeEnergyJPerMol), "J/mol");
        t.Add("internal energy U", D(s.InternalEnergyJPerMol), "J/mol");
        t.Add("zero-point energy", D(s.ZeroPointEnergyJPerMol), "J/mol");
        t.Add("Debye temperature from Cv", D(s.DebyeTemperatureFromCvK), "K");
        t.Add("Debye temperature, moment -2", D(s.DebyeTemperatureMomentMinus2K), "K");
        t.Add("Debye temperature, log moment", D(s.DebyeTemperatureMomentLogK), "K");
        t.Add("Debye temperature, moment 2", D(s.DebyeTemperatureMoment2K), "K");
        t.Add("molar mass (mean per atom)", D(s.MolarMassKgPerMol * 1000), "g/mol");
        if (s.KappaWPerMK is not null || s.KappaMinWPerMK is not null)
        {
            t.Add("thermal conductivity (estimate)", D(s.KappaWPerMK), "W/(m K)");
            t.Add("minimum conductivity (Cahill-Pohl-Watson)", D(s.KappaMinWPerMK), "W/(m K)");
        }

        return t;
    }

    private static string Parameters(PlannedPoint point) =>
        string.Join(", ", point.Parameters.Select(p => $"{p.Key} = {Convert.ToString(p.Value, CultureInfo.InvariantCulture)}"));

    private static string I(long v) => v.ToString(CultureInfo.InvariantCulture);
}
