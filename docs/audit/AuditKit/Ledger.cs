using System.Globalization;
using System.Text;

namespace LatticeSweep.Audit;

/// <summary>One number of the engine beside its reference.</summary>
internal sealed record Comparison(
    string CaseId, string Job, string Quantity, string Where, double Engine, double Reference, double Tolerance, string Source)
{
    public double Excess => Math.Abs(Engine - Reference) / Tolerance;

    public bool Within => Excess <= 1 && double.IsFinite(Engine);
}

/// <summary>Every comparison of a run, the cases the engine refused or failed, the references the audit could not settle.</summary>
internal sealed class Ledger
{
    private readonly List<Comparison> _all = [];
    private readonly List<string> _failures = [];
    private readonly Dictionary<string, int> _noReference = [];

    public int Beyond => _all.Count(c => !c.Within);

    public int Failures => _failures.Count;

    public void Add(string caseId, string job, string quantity, string where, double? engine, double reference, double tolerance, string source)
    {
        if (engine is null)
        {
            _failures.Add($"{caseId}: {quantity} ({where}) is empty, reference {reference:G6} ({job})");
            return;
        }

        _all.Add(new Comparison(caseId, job, quantity, where, engine.Value, reference, tolerance, source));
    }

    public void NoReference(string quantity) => _noReference[quantity] = _noReference.GetValueOrDefault(quantity) + 1;

    public void EngineFailure(string caseId, string job, int code, string output)
    {
        var lines = output.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        _failures.Add($"{caseId}: exit {code}: {string.Join(" | ", lines.TakeLast(3))} ({job})");
    }

    public void WriteReport(string work, int seed, int cases, TimeSpan elapsed)
    {
        var inv = CultureInfo.InvariantCulture;
        var csv = new StringBuilder("case,quantity,where,engine,reference,tolerance,excess,within,source,job\n");
        foreach (var c in _all)
        {
            csv.AppendLine(string.Join(",", c.CaseId, c.Quantity, Q(c.Where), c.Engine.ToString("R", inv), c.Reference.ToString("R", inv),
                c.Tolerance.ToString("R", inv), c.Excess.ToString("G4", inv), c.Within ? "yes" : "no", Q(c.Source), c.Job));
        }

        File.WriteAllText(Path.Combine(work, "comparisons.csv"), csv.ToString());

        var sb = new StringBuilder();
        sb.AppendLine($"LatticeSweep random-case audit: seed {seed}, {cases} cases, {elapsed:mm\\:ss} (mm:ss)");
        sb.AppendLine($"{_all.Count} numbers compared: {_all.Count - Beyond} within tolerance, {Beyond} beyond; {_failures.Count} cases or numbers missing");
        sb.AppendLine();
        sb.AppendLine($"{"quantity",-34} {"within",7} {"beyond",7} {"no ref",7} {"cases beyond",12}  worst |diff|/tol");
        foreach (var g in _all.GroupBy(c => c.Quantity).OrderBy(g => g.Key))
        {
            var worst = g.MaxBy(c => c.Excess)!;
            var beyondCases = g.Where(c => !c.Within).Select(c => c.CaseId).Distinct().Count();
            sb.AppendLine($"{g.Key,-34} {g.Count(c => c.Within),7} {g.Count(c => !c.Within),7} {_noReference.GetValueOrDefault(g.Key),7} {beyondCases,12}  {worst.Excess.ToString("G3", inv)}");
        }

        foreach (var (q, n) in _noReference.Where(p => !_all.Any(c => c.Quantity == p.Key)))
        {
            sb.AppendLine($"{q,-34} {0,7} {0,7} {n,7} {0,12}");
        }

        sb.AppendLine();
        sb.AppendLine("Worst beyond tolerance (one per case and quantity):");
        foreach (var c in _all.Where(c => !c.Within).GroupBy(c => (c.CaseId, c.Quantity)).Select(g => g.MaxBy(c => c.Excess)!)
                     .OrderByDescending(c => c.Excess).Take(25))
        {
            var rel = c.Reference != 0 ? (c.Engine - c.Reference) / Math.Abs(c.Reference) : double.NaN;
            sb.AppendLine($"  {c.Quantity} {c.Where}: engine {c.Engine:G7}, reference {c.Reference:G7} (rel {rel:G3}, tol {c.Tolerance:G3}, {c.Excess:G3} x tol) {c.Job}");
        }

        if (_failures.Count > 0)
        {
            sb.AppendLine();
            sb.AppendLine("Missing or failed:");
            foreach (var f in _failures.Take(25))
            {
                sb.AppendLine("  " + f);
            }
        }

        File.WriteAllText(Path.Combine(work, "summary.txt"), sb.ToString());
        Console.Write(sb.ToString());
    }

    private static string Q(string s) => "\"" + s.Replace("\"", "'") + "\"";
}
