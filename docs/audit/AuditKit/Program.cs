using System.Diagnostics;

namespace LatticeSweep.Audit;

/// <summary>audit-kit LATSWEEP_DLL WORKDIR SEED NCASES: generate, run, compare, summarise (docs/audit/README.md).</summary>
internal static class Program
{
    public static int Main(string[] args)
    {
        if (args.Length != 4 || !int.TryParse(args[2], out var seed) || !int.TryParse(args[3], out var count) || count < 1)
        {
            Console.Error.WriteLine("usage: audit-kit LATSWEEP_DLL WORKDIR SEED NCASES (SEED and NCASES whole numbers, NCASES >= 1)");
            return 2;
        }

        var dll = Path.GetFullPath(args[0]);
        var work = Path.GetFullPath(args[1]);
        Directory.CreateDirectory(work);
        ExtendedGenerator generator;
        try
        {
            generator = new ExtendedGenerator(seed, ExtendedGenerator.Parse(Environment.GetEnvironmentVariable("AUDIT_KINDS")));
        }
        catch (ArgumentException e)
        {
            Console.Error.WriteLine(e.Message);
            return 2;
        }

        var ledger = new Ledger();
        var clock = Stopwatch.StartNew();
        int? only = int.TryParse(Environment.GetEnvironmentVariable("AUDIT_ONLY"), out var o) ? o : null;
        for (var k = 0; k < count; k++)
        {
            var c = generator.Next($"audit-{seed}-{k:D4}");
            if (only is not null && only != k)
            {
                continue; // AUDIT_ONLY=N re-runs case N alone (the generator still draws every earlier case)
            }

            var dir = Path.Combine(work, c.Id);
            Directory.CreateDirectory(dir);
            var job = Path.Combine(dir, "job.toml");
            File.WriteAllText(job, c.ToToml());
            if (Environment.GetEnvironmentVariable("AUDIT_JOBS_ONLY") == "1")
            {
                continue; // write the job files alone: shows which cases a seed draws, e.g. that a new kind moved no earlier case
            }

            // AUDIT_REUSE=1: compare the results an earlier run left for this same job file (a changed kit, the same engine)
            var reuse = Environment.GetEnvironmentVariable("AUDIT_REUSE") == "1" && Directory.Exists(Path.Combine(dir, "results"))
                && File.Exists(Path.Combine(dir, "latsweep.log"));
            var (code, output) = reuse ? (0, File.ReadAllText(Path.Combine(dir, "latsweep.log"))) : Cli.Run(dll, dir, job);
            // exit 4: every point has results but some models are unstable (README); the audit checks that verdict
            if (code != 0 && code != 4)
            {
                ledger.EngineFailure(c.Id, job, code, output);
                continue;
            }

            try
            {
                var results = Directory.GetDirectories(Path.Combine(dir, "results")).Single();
                Checks.All(c, job, results, ledger);
            }
            catch (Exception e) when (e is not OutOfMemoryException)
            {
                ledger.EngineFailure(c.Id, job, -1, "audit could not read the results: " + e.Message);
            }

            if ((k + 1) % 10 == 0 || k + 1 == count)
            {
                Console.Error.WriteLine($"[{clock.Elapsed:mm\\:ss}] {k + 1}/{count} cases, {ledger.Beyond} beyond tolerance so far");
            }
        }

        ledger.WriteReport(work, seed, count, clock.Elapsed);
        return ledger.Beyond > 0 || ledger.Failures > 0 ? 1 : 0;
    }
}

/// <summary>Runs the real command on one job file in its own folder (its own store, results and logs).</summary>
internal static class Cli
{
    public static (int Code, string Output) Run(string dll, string dir, string job)
    {
        var psi = new ProcessStartInfo("dotnet")
        {
            WorkingDirectory = dir,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
        };
        foreach (var a in new[] { dll, "run", job, "--out", Path.Combine(dir, "results"), "--store", Path.Combine(dir, "store.db"), "--workers", "1" })
        {
            psi.ArgumentList.Add(a);
        }

        using var p = Process.Start(psi)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEnd();
        p.WaitForExit();
        var text = stdout.Result + stderr;
        File.WriteAllText(Path.Combine(dir, "latsweep.log"), text);
        return (p.ExitCode, text);
    }
}
