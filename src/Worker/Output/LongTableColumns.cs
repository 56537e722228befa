using LatticeSweep.Worker.Catalog;

namespace LatticeSweep.Worker.Output;

/// <summary>
/// The long tables of a chunk (hundreds of rows per point: DOS bins, mode levels, displacements,
/// sound speeds) built straight into their typed column arrays, point by point, without a row
/// object, a per-cell delegate or a generic collection over our own row types.
/// </summary>
/// <remarks>
/// Why: in a fresh <c>latsweep run</c> the generic row path (<see cref="TableSpec{TRow}.Rows"/> over
/// <see cref="RowOf{T}"/> lists built with LINQ) is JIT'd on first use and runs as tier-0 code for
/// most of the first chunk, since ReadyToRun cannot precompile generic code over our structs and
/// the libraries' types; this code is plain, non-generic loops over primitive arrays, which the
/// ReadyToRun image holds. The schema stays <see cref="ResultSchemas"/>: the columns come in its
/// order, its point columns (id, swept parameters) are taken from it, and a table that has a column
/// this builder does not know is left to the generic path (null), so adding a column cannot
/// change a file. Tests hold both paths equal cell by cell.
/// </remarks>
internal static partial class LongTableColumns
{
    /// <summary>dos/: each point's total curve, then each site's partial curve, as <c>ChunkTables.DosRows</c> lists them.</summary>
    public static TableRows? Dos(TableSpec<RowOf<DosValue>> spec, IReadOnlyList<PointOutcome> points)
    {
        var starts = RowStarts(points, result =>
        {
            var bins = result.Dos.FrequencyThz.Length;
            var rows = bins;
            foreach (var curve in result.Dos.PartialBySite)
            {
                rows += Math.Min(bins, curve.Length);
            }

            return rows;
        });

        var total = starts[^1];
        var curveName = new string?[total];
        var site = new int?[total];
        var frequency = new double?[total];
        var density = new double?[total];
        var error = new double?[total];
        for (var p = 0; p < points.Count; p++)
        {
            var result = points[p].Result!;
            var frequencies = result.Dos.FrequencyThz.AsSpan();
            var totalCurve = result.Dos.Total.AsSpan();
            var errors = result.Errors is { } e ? e.DosTotal.AsSpan() : [];
            var row = starts[p];
            for (var i = 0; i < frequencies.Length; i++, row++)
            {
                curveName[row] = "total";
                frequency[row] = frequencies[i];
                density[row] = totalCurve[i];
                error[row] = i < errors.Length && double.IsFinite(errors[i]) ? errors[i] : null;
            }

            var partials = result.Dos.PartialBySite;
            for (var s = 0; s < partials.Length; s++)
            {
                var curve = partials[s].AsSpan();
                var n = Math.Min(frequencies.Length, curve.Length);
                for (var i = 0; i < n; i++, row++)
                {
                    curveName[row] = "site";
                    site[row] = s;
                    frequency[row] = frequencies[i];
                    density[row] = curve[i];
                }
            }
        }

        return Assemble(spec, points, starts, name => name switch
        {
            "curve" => curveName,
            "site" => site,
            "freq_thz" => frequency,
            "dos_per_thz_per_cell" => density,
            "dos_stderr_per_thz_per_cell" => error,
            _ => null,
        });
    }

    /// <summary>modes/: each point's distinct mode levels in the Engine's order.</summary>
    public static TableRows? Modes(TableSpec<RowOf<Engine.Results.ModeLevel>> spec, IReadOnlyList<PointOutcome> points)
    {
        var starts = RowStarts(points, result => result.Modes.Length);

        var total = starts[^1];
        var frequency = new double?[total];
        var multiplicity = new long?[total];
        var configuration = new int?[total];
        for (var p = 0; p < points.Count; p++)
        {
            var row = starts[p];
            foreach (var mode in points[p].Result!.Modes)
            {
                frequency[row] = mode.FrequencyThz;
                multiplicity[row] = mode.Multiplicity;
                configuration[row] = mode.Configuration;
                row++;
            }
        }

        return Assemble(spec, points, starts, name => name switch
        {
            "freq_thz" => frequency,
            "multiplicity" => multiplicity,
            "configuration" => configuration,
            _ => null,
        });
    }

    /// <summary>mean_square_displacements/: each point's rows in the Engine's order.</summary>
    public static TableRows? Displacements(TableSpec<RowOf<Engine.Results.DisplacementRow>> spec, IReadOnlyList<PointOutcome> points)
    {
        var starts = RowStarts(points, result => result.Displacements.Length);

        var total = starts[^1];
        var temperature = new double?[total];
        var site = new int?[total];
        var label = new string?[total];
        var x = new double?[total];
        var y = new double?[total];
        var z = new double?[total];
        for (var p = 0; p < points.Count; p++)
        {
            var row = starts[p];
            foreach (var d in points[p].Result!.Displacements)
            {
                temperature[row] = d.TemperatureK;
                site[row] = d.Site;
                label[row] = d.SiteLabel;
                x[row] = d.MsdXNm2;
                y[row] = d.MsdYNm2;
                z[row] = d.MsdZNm2;
                row++;
            }
        }

        return Assemble(spec, points, starts, name => name switch
        {
            "temperature_k" => temperature,
            "site" => site,
            "site_label" => label,
            "msd_x_nm2" => x,
            "msd_y_nm2" => y,
            "msd_z_nm2" => z,
            _ => null,
        });
    }

    /// <summary>sound_speeds/: each point's directions, and each direction's branches slowest first.</summary>
    public static TableRows? SoundSpeeds(TableSpec<RowOf<SoundSpeedValue>> spec, IReadOnlyList<PointOutcome> points)
    {
        var starts = RowStarts(points, result =>
        {
            var rows = 0;
            foreach (var s in result.Summary.SoundSpeeds)
            {
                rows += s.SpeedsMPerS.Length;
            }

            return rows;
        });

        var total = starts[^1];
        var direction = new string?[total];
        var branch = new int?[total];
        var speed = new double?[total];
        for (var p = 0; p < points.Count; p++)
        {
            var row = starts[p];
            foreach (var s in points[p].Result!.Summary.SoundSpeeds)
            {
                var speeds = s.SpeedsMPerS;
                for (var i = 0; i < speeds.Length; i++, row++)
                {
                    direction[row] = s.Direction;
                    branch[row] = i;
                    speed[row] = speeds[i];
                }
            }
        }

        return Assemble(spec, points, starts, name => name switch
        {
            "direction" => direction,
            "branch" => branch,
            "speed_m_per_s" => speed,
            _ => null,
        });
    }

    /// <summary>Where each point's rows start (and, last, the total): point p has rows starts[p] to starts[p + 1].</summary>
    private static int[] RowStarts(IReadOnlyList<PointOutcome> points, Func<Engine.Results.PointResult, int> rowsOf)
    {
        var starts = new int[points.Count + 1];
        for (var p = 0; p < points.Count; p++)
        {
            starts[p + 1] = starts[p] + rowsOf(points[p].Result!);
        }

        return starts;
    }

    /// <summary>
    /// The table in the spec's column order: its point columns from the spec (one value per point,
    /// repeated over the point's rows <paramref name="starts"/>[p] to <paramref name="starts"/>[p + 1]),
    /// its own from <paramref name="own"/>; null when <paramref name="own"/> lacks one of them.
    /// </summary>
    private static TableRows? Assemble<TRow>(TableSpec<TRow> spec, IReadOnlyList<PointOutcome> points, int[] starts, Func<string, Array?> own)
    {
        var columns = spec.Columns;
        var values = new Array[columns.Count];
        for (var c = 0; c < values.Length; c++)
        {
            if (columns[c].CollectPerPoint(points) is { } perPoint)
            {
                values[c] = Repeat(perPoint, starts);
            }
            else if (own(columns[c].Def.Name) is { } array && array.GetType() == ColumnValues.ArrayType(columns[c].Def.Type))
            {
                values[c] = array;
            }
            else
            {
                return null;
            }
        }

        return new TableRows(spec.Name, spec.Defs, starts[^1], values);
    }

    /// <summary>Value p of <paramref name="perPoint"/> on every row of point p.</summary>
    private static Array Repeat(Array perPoint, int[] starts) => perPoint switch
    {
        string?[] a => Repeat(a, starts),
        double?[] a => Repeat(a, starts),
        long?[] a => Repeat(a, starts),
        int?[] a => Repeat(a, starts),
        bool?[] a => Repeat(a, starts),
        DateTime?[] a => Repeat(a, starts),
        _ => throw new InvalidOperationException($"unexpected column array {perPoint.GetType().Name}"),
    };

    /// <remarks>One generic body: its instantiations are over CoreLib's primitives (and string), not our own structs.</remarks>
    private static T[] Repeat<T>(T[] perPoint, int[] starts)
    {
        var values = new T[starts[^1]];
        for (var p = 0; p < perPoint.Length; p++)
        {
            var v = perPoint[p];
            for (var r = starts[p]; r < starts[p + 1]; r++)
            {
                values[r] = v;
            }
        }

        return values;
    }
}
