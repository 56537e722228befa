using System.Collections.Immutable;
using System.Globalization;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning.Expansion;
using LatticeSweep.Worker.Planning.Fields;
using LatticeSweep.Worker.Planning.Specs;
using Tomlyn.Model;

namespace LatticeSweep.Worker.Planning;

/// <summary>
/// From a parsed job file to a plan: reads the sections, resolves each axis path to a field,
/// checks every value, expands the points, checks each point's combination of values, gives each
/// point its id and collapses duplicates. All problems are collected and thrown together.
/// </summary>
internal static class SweepPlanner
{
    private const int MaxPointProblemsShown = 5;
    private const int MaxValueProblemsShown = 5;

    private static readonly Dictionary<CombineMode, string> CombineNames = new()
    {
        [CombineMode.Grid] = "grid",
        [CombineMode.Zip] = "zip",
        [CombineMode.LatinHypercube] = "latin_hypercube",
        [CombineMode.Random] = "random",
    };

    public static SweepPlan Plan(TomlDocument document, string text, ProblemCollector problems) => Plan(document, text, problems, lazy: false);

    /// <summary>
    /// Whether points can take a sample kind other than <c>[sample].kind</c>: then the section needs
    /// both the finite and the bulk keys. An axis listing only the base kind (say
    /// <c>values = ["finite"]</c> beside <c>kind = "finite"</c>) does not; a range, a candidates column
    /// or any other value does.
    /// </summary>
    private static bool KindSwept(SweepDeclaration sweep, string? baseKind) =>
        sweep.Axes.Any(a => a.Path == "sample.kind"
            && (a.Source is not ValueListSource list || list.Values.Any(v => v is not string s || s != baseKind)))
        || (sweep.Candidates?.Columns.Any(c => c.Value == "sample.kind") ?? false);

    /// <summary>
    /// Plans the job. <paramref name="lazy"/> (a worker, for a sweep whose submit kept every point of
    /// the expansion): points are not applied, checked or hashed up front; a point's id is computed
    /// when it is asked for, and the plan's <see cref="SweepPlan.SpecHash"/> is empty (the caller
    /// checks <see cref="SweepPlan.DefinitionHash"/> against the one stored at submit instead).
    /// </summary>
    internal static SweepPlan Plan(TomlDocument document, string text, ProblemCollector problems, bool lazy)
    {
        var root = new TableReader(document, document.Root, "", problems, new SourceLocation(1, 1));
        root.RejectUnknown("sweep", "model", "sample", "output");
        var sweep = SweepSectionReader.Read(root.SubTable("sweep"), document.File);
        var kindSwept = KindSwept(sweep, root.Raw("sample") is TomlTable sampleTable && sampleTable.TryGetValue("kind", out var kindValue) ? kindValue as string : null);

        var modelTable = root.SubTable("model", required: true);
        var model = modelTable is null ? null : ModelSectionReader.Read(modelTable);
        var dimension = model?.Dimension ?? 0;
        var sample = SampleSectionReader.Read(root.SubTable("sample", required: true), dimension, kindSwept);
        var output = OutputSectionReader.Read(root.SubTable("output"), dimension, model, sample, kindSwept);
        problems.ThrowIfAny();

        var (options, tables) = output!.Value;
        var baseSpec = new BoundSpec(model!, sample!, options.Conductivity);
        SampleSectionReader.CheckWithEngine(root.SubTable("sample"), baseSpec, options);
        problems.ThrowIfAny();
        var catalog = FieldCatalog.Build(baseSpec);
        var axes = ResolveAxes(sweep, catalog, problems);
        var candidateTable = sweep.Candidates is { } cd ? CandidateTableReader.Read(cd, problems) : null;
        var candidates = candidateTable is null ? null : ResolveCandidates(sweep.Candidates!, candidateTable, catalog, problems);
        CheckColumns(axes, candidates, problems);
        problems.ThrowIfAny();

        var total = SweepExpansion.Count(sweep.Combine, sweep.Count, candidates, axes);
        if (total > sweep.MaxPoints)
        {
            var at = root.SubTable("sweep");
            var where = at is null ? new SourceLocation(1, 1) : at.Where("max_points");
            problems.Add(where, "sweep.max_points",
                $"the sweep expands to {Show(total)} points, more than max_points = {Show(sweep.MaxPoints)}; "
                + $"raise [sweep] max_points (up to {Show(SweepSectionReader.HardMaxPoints)}) or use fewer values");
            problems.ThrowIfAny();
        }

        var columns = (candidates?.Columns ?? []).Concat(axes).ToList();
        var bindings = columns
            .Select((c, i) => (c, i))
            .Where(x => x.c.Field is not null)
            .OrderBy(x => x.c.Field!.ApplyOrder).ThenBy(x => x.i)
            .Select(x => new ParameterBinding(x.c.Column, x.c.Field!))
            .ToImmutableArray();
        var template = new JobTemplate(baseSpec, options, bindings);

        var expansion = new IndexedExpansion(sweep.Combine, sweep.Count, sweep.Seed, candidates, axes);
        var order = ColumnOrder(columns);
        var names = order.Select(j => columns[j].Column).ToArray();
        var head = "name=" + sweep.Name + "\ncombine=" + CombineNames[sweep.Combine] + "\ncandidates=" + (candidateTable?.ContentHash ?? "-") + "\n"
            + CanonicalSpec.Write(baseSpec, options);
        var definitionHash = DefinitionHash(head, columns, expansion.Count);

        PlanPoints points;
        int[]? kept;
        int duplicates;
        string specHash;
        if (lazy)
        {
            var keyOf = PointKeyFunction(expansion, columns, template, options);
            points = new PlanPoints((int)expansion.Count, keyOf, k => Parameters(expansion, order, names, k));
            (kept, duplicates, specHash) = (null, 0, "");
        }
        else
        {
            ulong[] keys;
            (keys, kept, duplicates) = Expand(document, expansion, columns, template, options, problems);
            problems.ThrowIfAny();
            points = new PlanPoints(keys, kept, k => Parameters(expansion, order, names, k));
            specHash = PointIdentity.Hash(head, keys);

            // A worker may plan this sweep lazily only when every point of the expansion was kept (point index = position).
            definitionHash = kept is null && keys.Length == expansion.Count ? definitionHash : null;
        }

        var axisInfos = columns.Select((c, j) => c.Interval is { } drawn
            ? new AxisInfo(c.Path, c.Column, c.Unit, c.ValueType, [])
            {
                // Drawn values: one point each, so the axis keeps its interval, not its values (a 10^6-point sweep's record held 10^6 per axis).
                Drawn = new DrawnRange(drawn.From, drawn.To, drawn.Log, sweep.Count ?? 1, AxisBins.BinsFor(sweep.Count ?? 1)),
            }
            : new AxisInfo(c.Path, c.Column, c.Unit, c.ValueType, [.. DistinctValues(expansion, kept, points.Count, j, sweep.Combine)])).ToImmutableArray();

        return new SweepPlan
        {
            SweptKeys = SweptKeysOf(document, sweep, catalog, columns),
            SweepName = sweep.Name,
            Description = sweep.Description,
            SourcePath = Path.GetFullPath(document.File),
            SpecText = text,
            Axes = axisInfos,
            Points = points,
            Outputs = tables,
            Template = template,
            SpecHash = specHash,
            DefinitionHash = definitionHash,
            DuplicatePointsCollapsed = duplicates,
            Combine = CombineNames[sweep.Combine],
            CandidatesFile = candidateTable?.File,
            CandidateRows = candidateTable is null ? null : new CandidateRows(
                Path.GetFullPath(candidateTable.File),
                Path.GetExtension(candidateTable.File).Equals(".csv", StringComparison.OrdinalIgnoreCase),
                candidateTable.RowLines,
                SweepExpansion.Count(sweep.Combine, sweep.Count, null, axes)),
            WarnPointTimeS = sweep.WarnPointTimeS,
        };
    }

    /// <summary>Where each swept column's values are written: an axis's values key, a candidates column's entry.</summary>
    private static ImmutableArray<SweptKey> SweptKeysOf(TomlDocument document, SweepDeclaration sweep, FieldCatalog catalog, IReadOnlyList<PlanAxis> columns)
    {
        var keys = new List<SweptKey>();
        for (var i = 0; i < sweep.Axes.Length; i++)
        {
            var decl = sweep.Axes[i];
            var sourceKey = decl.Source switch
            {
                RangeSource => "range",
                RandomSource => "random",
                _ => "values",
            };
            if (catalog.TryResolve(decl.Path, out var field) && columns.FirstOrDefault(c => ReferenceEquals(c.Field, field)) is { } column)
            {
                var at = decl.Table.Where(sourceKey);
                keys.Add(new SweptKey(field.Path, column.Column, [.. catalog.OtherNamesOf(field)], $"sweep.axes[{i}].{sourceKey}", at.Line, at.Column));
            }
        }

        if (sweep.Candidates is { } cd)
        {
            var mapping = cd.Table.Raw("columns") as TomlTable;
            foreach (var (csvColumn, path) in cd.Columns)
            {
                if (catalog.TryResolve(path, out var field) && columns.FirstOrDefault(c => ReferenceEquals(c.Field, field)) is { } column)
                {
                    var at = mapping is null ? SourceLocation.Unknown : document.Locate(mapping, csvColumn);
                    at = at.IsKnown ? at : cd.Table.Where("columns");
                    keys.Add(new SweptKey(field.Path, column.Column, [.. catalog.OtherNamesOf(field)], $"sweep.candidates.columns.{csvColumn}", at.Line, at.Column, csvColumn));
                }
            }
        }

        return [.. keys];
    }

    /// <summary>
    /// A hash of what decides a sweep's points besides the program: the spec hash's head (name,
    /// combine, the candidates file's content, the canonical base spec with its options), every
    /// column (path, name, unit, type, values) and the number of points of the expansion.
    /// </summary>
    private static string DefinitionHash(string head, IReadOnlyList<PlanAxis> columns, long count)
    {
        var text = new System.Text.StringBuilder(head).Append("\npoints=").Append(count.ToString(System.Globalization.CultureInfo.InvariantCulture)).Append('\n');
        foreach (var c in columns)
        {
            text.Append("column=").Append(c.Path).Append('|').Append(c.Column).Append('|').Append(c.Unit).Append('|').Append(c.ValueType)
                .Append('|').Append(CatalogValues(c.Values)).Append('\n');
        }

        return PointIdentity.Hash(text.ToString());
    }

    private static string CatalogValues(IEnumerable<object> values) => string.Join(";", values.Select(PointIdentity.Format));

    /// <summary>The id key of the point at expansion position k, as <see cref="Expand"/> computes it (without the checks).</summary>
    private static Func<long, ulong> PointKeyFunction(IndexedExpansion expansion, IReadOnlyList<PlanAxis> columns, JobTemplate template, SolveOptions options)
    {
        var order = ColumnOrder(columns);
        var names = order.Select(j => columns[j].Column).ToArray();
        var byIdentity = Enumerable.Range(0, names.Length).OrderBy(j => SweptColumnNames.IdentityName(names[j]), StringComparer.Ordinal).ToArray();
        var identityNames = byIdentity.Select(j => SweptColumnNames.IdentityName(names[j])).ToArray();
        return k =>
        {
            var parameters = Parameters(expansion, order, names, k);
            var spec = PointBinder.Apply(template, parameters);
            var byName = new object[byIdentity.Length];
            for (var j = 0; j < byIdentity.Length; j++)
            {
                byName[j] = parameters.ValueAt(byIdentity[j]);
            }

            return PointIdentity.PointKey(spec, options, identityNames, byName);
        };
    }

    /// <summary>Columns in ordinal name order (a point's <see cref="PointParameters"/> order), as indices into <paramref name="columns"/>.</summary>
    private static int[] ColumnOrder(IReadOnlyList<PlanAxis> columns) =>
        [.. Enumerable.Range(0, columns.Count).OrderBy(j => columns[j].Column, StringComparer.Ordinal)];

    private static PointParameters Parameters(IndexedExpansion expansion, int[] order, string[] names, long k)
    {
        var values = new object[order.Length];
        expansion.Fill(k, values);
        var sorted = new object[order.Length];
        for (var j = 0; j < order.Length; j++)
        {
            sorted[j] = values[order[j]];
        }

        return new PointParameters(names, sorted);
    }

    /// <summary>
    /// A column's values in order of first appearance over the kept points. In a grid where no
    /// point was left out an axis shows every value in file order, so it is not scanned.
    /// </summary>
    private static IEnumerable<object> DistinctValues(IndexedExpansion expansion, int[]? kept, int count, int column, CombineMode mode)
    {
        if (mode == CombineMode.Grid && kept is null && count > 0 && expansion.AxisOfColumn(column) is { } axis)
        {
            return axis.Values;
        }

        var values = new object[expansion.Columns];
        return Enumerable.Range(0, count).Select(i =>
        {
            expansion.Fill(kept is null ? i : kept[i], values);
            return values[column];
        }).Distinct();
    }

    /// <summary>
    /// Every point's spec applied and checked, its interaction terms checked and its id computed, in
    /// blocks computed on every core and then taken in plan order. Returns the kept points' id keys,
    /// their expansion positions when some were collapsed as duplicates (else null), and how many were.
    /// </summary>
    private static (ulong[] Keys, int[]? Kept, int Duplicates) Expand(
        TomlDocument document,
        IndexedExpansion expansion,
        IReadOnlyList<PlanAxis> columns,
        JobTemplate template,
        SolveOptions options,
        ProblemCollector problems)
    {
        var total = (int)expansion.Count;
        var keys = new ulong[total];
        List<int>? kept = null;
        var keptCount = 0;

        var order = ColumnOrder(columns);
        var names = order.Select(j => columns[j].Column).ToArray();
        // Ids hash "name=value" lines in ordinal order of the names without the axis_ prefix.
        var byIdentity = Enumerable.Range(0, names.Length).OrderBy(j => SweptColumnNames.IdentityName(names[j]), StringComparer.Ordinal).ToArray();
        var identityNames = byIdentity.Select(j => SweptColumnNames.IdentityName(names[j])).ToArray();
        var badCombinations = new List<string>();
        var badCount = 0;
        var interactionProblems = new List<(string Key, string Message)>();
        var interactionSeen = new HashSet<(string, string)>();
        var interactionCount = 0;

        const int blockSize = 1 << 14;
        var blockKeys = new ulong[Math.Min(blockSize, Math.Max(1, total))];
        var blockWrong = new string?[blockKeys.Length];
        var blockFound = new IReadOnlyList<ModelProblem>?[blockKeys.Length];
        for (var start = 0; start < total; start += blockSize)
        {
            var n = Math.Min(blockSize, total - start);
            Array.Clear(blockWrong);
            Array.Clear(blockFound);

            // Each point's spec, checks and id hash are independent: computed on every core.
            Parallel.For(start, start + n, k =>
            {
                var parameters = Parameters(expansion, order, names, k);
                var spec = PointBinder.Apply(template, parameters);
                var i = k - start;
                if (SpecChecks.Check(spec) is { } wrong)
                {
                    blockWrong[i] = wrong;
                    return;
                }

                var found = InteractionProblems.Of(spec);
                if (found.Count > 0)
                {
                    blockFound[i] = found;
                    return;
                }

                var byName = new object[byIdentity.Length];
                for (var j = 0; j < byIdentity.Length; j++)
                {
                    byName[j] = parameters.ValueAt(byIdentity[j]);
                }

                blockKeys[i] = PointIdentity.PointKey(spec, options, identityNames, byName);
            });

            for (var i = 0; i < n; i++)
            {
                var k = start + i;
                if (blockWrong[i] is { } wrong)
                {
                    badCount++;
                    if (badCombinations.Count < MaxPointProblemsShown)
                    {
                        badCombinations.Add($"{wrong} (at {Describe(Parameters(expansion, order, names, k))})");
                    }

                    Skip(ref kept, keptCount);
                    continue;
                }

                if (blockFound[i] is { } found)
                {
                    interactionCount++;
                    var parameters = Parameters(expansion, order, names, k);
                    foreach (var p in found)
                    {
                        var message = parameters.Count == 0 ? p.Message : $"{p.Message} (at {Describe(parameters)})";
                        if (interactionProblems.Count < MaxPointProblemsShown && interactionSeen.Add((p.Where, p.Message)))
                        {
                            interactionProblems.Add(("model." + p.Where, message));
                        }
                    }

                    Skip(ref kept, keptCount);
                    continue;
                }

                keys[keptCount++] = blockKeys[i];
                kept?.Add(k);
            }
        }

        var duplicates = CollapseDuplicates(keys, ref keptCount, ref kept);
        foreach (var (key, message) in interactionProblems)
        {
            problems.Add(KeyLocator.Locate(document, key), key, message);
        }

        if (interactionCount > 1 && interactionProblems.Count > 0)
        {
            problems.Add(new SourceLocation(1, 1), "sweep.axes", $"{Show(interactionCount)} point(s) in all have problems with their bends or potentials");
        }

        foreach (var message in badCombinations)
        {
            problems.Add(new SourceLocation(1, 1), "sweep.axes", message);
        }

        if (badCount > badCombinations.Count)
        {
            problems.Add(new SourceLocation(1, 1), "sweep.axes", $"... and {Show(badCount - badCombinations.Count)} more point(s) with invalid combinations of values");
        }

        if (keptCount < total)
        {
            Array.Resize(ref keys, keptCount);
        }

        return (keys, kept?.ToArray(), duplicates);
    }

    /// <summary>
    /// Collapses points with the same id (the same spec and values) to the first of them in plan order, among the
    /// first <paramref name="count"/> of <paramref name="keys"/>; returns how many were dropped. Repeated ids are
    /// found in a sorted copy of the keys, 8 bytes a point for the moment (a set of every key seen had taken ~20
    /// bytes a point, ~200 MB at 10^7 points, bench/README round 23); only when there are some are the keys walked
    /// again in plan order, with a set of the repeated ones.
    /// </summary>
    private static int CollapseDuplicates(ulong[] keys, ref int count, ref List<int>? kept)
    {
        HashSet<ulong>? repeated = null;
        var sorted = keys.AsSpan(0, count).ToArray();
        Array.Sort(sorted);
        for (var i = 1; i < sorted.Length; i++)
        {
            if (sorted[i] == sorted[i - 1])
            {
                (repeated ??= []).Add(sorted[i]);
            }
        }

        if (repeated is null)
        {
            return 0;
        }

        var positions = kept;
        var firsts = new HashSet<ulong>(repeated.Count);
        var collapsed = new List<int>(count);
        var n = 0;
        for (var i = 0; i < count; i++)
        {
            var key = keys[i];
            if (repeated.Contains(key) && !firsts.Add(key))
            {
                continue;
            }

            keys[n++] = key;
            collapsed.Add(positions is null ? i : positions[i]);
        }

        var dropped = count - n;
        count = n;
        kept = collapsed;
        return dropped;
    }

    /// <summary>A point is left out: from now on the kept points' expansion positions are listed.</summary>
    private static void Skip(ref List<int>? kept, int keptCount) => kept ??= [.. Enumerable.Range(0, keptCount)];

    private static List<PlanAxis> ResolveAxes(SweepDeclaration sweep, FieldCatalog catalog, ProblemCollector problems)
    {
        var axes = new List<PlanAxis>();
        var tables = new List<TableReader>();
        for (var i = 0; i < sweep.Axes.Length; i++)
        {
            var decl = sweep.Axes[i];
            var t = decl.Table;
            if (!catalog.TryResolve(decl.Path, out var field))
            {
                t.Error("path", $"'{EchoText.Of(decl.Path)}' names no sweepable field; {catalog.Suggest(decl.Path)}");
                continue;
            }

            var axis = decl.Source switch
            {
                ValueListSource v => FromValues(field, v.Values, t, "values", distinct: sweep.Combine != CombineMode.Zip),
                RangeSource { Steps: null } r => FromInterval(field, r, t, "range"),
                RangeSource r => FromRange(field, r, t),
                RandomSource r => FromRandom(field, r, sweep.Seed, (ulong)i, t),
                _ => null,
            };
            if (axis is not null)
            {
                axes.Add(axis);
                tables.Add(t);
            }
        }

        if (sweep.Combine == CombineMode.Zip && axes.Count > 1)
        {
            var n = axes[0].Values.Length;
            for (var i = 1; i < axes.Count; i++)
            {
                if (axes[i].Values.Length != n)
                {
                    tables[i].TableError($"combine = \"zip\" needs axes of equal length: '{EchoText.Of(axes[0].Path)}' has {n} values, '{EchoText.Of(axes[i].Path)}' has {axes[i].Values.Length}");
                }
            }
        }

        return axes;
    }

    private static PlanAxis? FromValues(SweepField field, IReadOnlyList<object> raw, TableReader t, string key, bool distinct = true)
    {
        var values = new List<object>(raw.Count);
        var seen = new HashSet<object>(); // an axis may have up to a million values: no quadratic search
        var bad = 0;
        for (var k = 0; k < raw.Count; k++)
        {
            var v = FieldValues.Coerce(field, raw[k], out var error);
            if (v is null)
            {
                // A few located examples say what is wrong; a million copies of the same message would not.
                if (++bad <= MaxValueProblemsShown)
                {
                    t.Problems.Add(t.Where(key), $"{t.KeyPath(key)}[{k}]", error!);
                }
            }
            else if (!distinct || seen.Add(v))
            {
                // A repeated value adds nothing to a grid; in a zip it pairs with another axis's value.
                values.Add(v);
            }
        }

        if (bad > MaxValueProblemsShown)
        {
            t.Problems.Add(t.Where(key), t.KeyPath(key), $"{bad - MaxValueProblemsShown} more values of this axis have the same kind of problem");
        }

        return bad == 0 ? Axis(field, values, null) : null;
    }

    private static PlanAxis? FromRange(SweepField field, RangeSource r, TableReader t)
    {
        if (field.ValueType == AxisValueType.Text)
        {
            t.Error("range", $"{field.Path} takes text; list its values with values = [...]");
            return null;
        }

        IEnumerable<object> values = field.ValueType == AxisValueType.Integer
            ? Spacing.Points(r.From, r.To, r.Steps!.Value, r.Log).Select(x => (object)(long)Math.Round(x, MidpointRounding.AwayFromZero))
            : Spacing.Points(r.From, r.To, r.Steps!.Value, r.Log).Select(x => (object)x);

        // Rounding a range of whole numbers may repeat a value; each value is kept once.
        return FromValues(field, values.Distinct().ToList(), t, "range");
    }

    private static PlanAxis? FromRandom(SweepField field, RandomSource r, ulong seed, ulong axisIndex, TableReader t)
    {
        if (field.ValueType == AxisValueType.Text)
        {
            t.Error("random", $"{field.Path} takes text; list its values with values = [...]");
            return null;
        }

        var interval = FromInterval(field, new RangeSource(r.From, r.To, null, r.Log), t, "random");
        if (interval is null)
        {
            return null;
        }

        var rng = new SplitMix64(seed, 100 + axisIndex);
        var values = Enumerable.Range(0, r.Count).Select(_ => interval.ValueAt(rng.NextDouble())).Distinct().ToList();
        return Axis(field, values, null);
    }

    /// <summary>An interval to sample; its ends are checked, which covers every value inside for the interval-shaped checks fields have.</summary>
    private static PlanAxis? FromInterval(SweepField field, RangeSource r, TableReader t, string key)
    {
        if (field.ValueType == AxisValueType.Text)
        {
            t.Error(key, $"{field.Path} takes text; list its values with values = [...]");
            return null;
        }

        var ok = true;
        foreach (var end in new[] { r.From, r.To })
        {
            object raw = field.ValueType == AxisValueType.Integer ? Math.Round(end) : end;
            if (FieldValues.Coerce(field, raw, out var error) is null)
            {
                t.Error(key, error!);
                ok = false;
            }
        }

        if (ok && field.ValueType == AxisValueType.Integer && Math.Ceiling(r.From) > Math.Floor(r.To))
        {
            t.Error(key, $"{field.Path} takes whole numbers, and none lies between {TableReader.Show(r.From)} and {TableReader.Show(r.To)}");
            ok = false;
        }

        return ok ? Axis(field, [], r) : null;
    }

    private static PlanAxis Axis(SweepField field, IReadOnlyList<object> values, RangeSource? interval) =>
        new(field.Path, SweptColumnNames.Of(field.ColumnName), field.Unit, field.ValueType, field, [.. values], interval);

    private static CandidateBlock? ResolveCandidates(CandidatesDeclaration decl, CandidateTable table, FieldCatalog catalog, ProblemCollector problems)
    {
        var before = problems.Count;
        var t = decl.Table;
        var columns = new List<(int Index, PlanAxis Axis)>();
        var headers = table.Columns.ToList();
        foreach (var (csvColumn, path) in decl.Columns)
        {
            var index = table.ColumnIndex(csvColumn);
            if (index < 0)
            {
                t.Problems.Add(t.Where("columns"), $"sweep.candidates.columns.\"{csvColumn}\"", $"the candidates file has no column '{EchoText.Of(csvColumn)}'; " + KeySuggestions.Hint(csvColumn, headers));
                continue;
            }

            if (!catalog.TryResolve(path, out var field))
            {
                t.Problems.Add(t.Where("columns"), $"sweep.candidates.columns.\"{csvColumn}\"", $"'{EchoText.Of(path)}' names no sweepable field; {catalog.Suggest(path)}");
                continue;
            }

            columns.Add((index, new PlanAxis(field.Path, SweptColumnNames.Of(field.ColumnName), field.Unit, field.ValueType, field, [], null)));
        }

        foreach (var keep in decl.Keep)
        {
            var index = table.ColumnIndex(keep);
            if (index < 0)
            {
                t.Error("keep", $"the candidates file has no column '{EchoText.Of(keep)}'; " + KeySuggestions.Hint(keep, headers));
                continue;
            }

            columns.Add((index, new PlanAxis($"candidates.{keep}", SweptColumnNames.Of(ColumnNames.Snake(keep)), "", AxisValueType.Text, null, [], null)));
        }

        if (problems.Count > before)
        {
            return null;
        }

        var rows = new List<ImmutableArray<object>>(table.Rows.Length);
        for (var r = 0; r < table.Rows.Length; r++)
        {
            var row = new object[columns.Count];
            for (var j = 0; j < columns.Count; j++)
            {
                var (index, axis) = columns[j];
                var cell = table.Rows[r][index];
                if (axis.Field is null)
                {
                    row[j] = Convert.ToString(cell, CultureInfo.InvariantCulture) ?? "";
                    continue;
                }

                var value = FieldValues.Coerce(axis.Field, cell is string s && s.Length == 0 ? null : cell, out var error);
                if (value is null)
                {
                    problems.Add(new JobFileProblem(table.File, table.RowLines[r], index + 1, table.Columns[index], error!));
                }

                row[j] = value!;
            }

            rows.Add([.. row]);
        }

        return problems.Count > before ? null : new CandidateBlock([.. columns.Select(c => c.Axis)], [.. rows]);
    }

    private static void CheckColumns(IReadOnlyList<PlanAxis> axes, CandidateBlock? candidates, ProblemCollector problems)
    {
        var all = (candidates?.Columns ?? []).Concat(axes).ToList();
        var fields = new HashSet<string>(StringComparer.Ordinal);
        var names = new HashSet<string>(StringComparer.Ordinal);
        foreach (var c in all)
        {
            if (c.Field is not null && !fields.Add(c.Field.Path))
            {
                problems.Add(new SourceLocation(1, 1), "sweep.axes", $"'{EchoText.Of(c.Path)}' is set by two axes (or an axis and a candidates column); each field may be swept once");
            }
            else if (!names.Add(c.Column))
            {
                problems.Add(new SourceLocation(1, 1), "sweep.axes", $"two swept fields would both be named column '{EchoText.Of(c.Column)}' ({EchoText.Of(c.Path)}); rename a site label or a candidates column");
            }
        }
    }

    private static string Describe(IEnumerable<KeyValuePair<string, object>> parameters) =>
        string.Join(", ", parameters.Select(p => $"{p.Key} = {PointIdentity.Format(p.Value)[2..]}"));

    private static string Show(long n) => n.ToString("N0", CultureInfo.InvariantCulture);
}
