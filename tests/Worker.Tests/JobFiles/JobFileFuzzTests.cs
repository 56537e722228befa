using System.Text;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Solving;
using LatticeSweep.Worker.Cli;
using LatticeSweep.Worker.JobFiles;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Tests.Support;
using Xunit.Abstractions;

namespace LatticeSweep.Worker.Tests.JobFiles;

/// <summary>
/// Fuzzing the job-file reader: mutants of the example jobs (fixed seed, so every run sees the same
/// files) must each end in exit code 2 with every problem located (file and line, or the key), or
/// plan and run correctly. Never a crash, a hang or a stack trace.
/// </summary>
public sealed class JobFileFuzzTests : IDisposable
{
    // The same mutants on every run; a deeper search: LATSWEEP_TEST_FUZZ_SEED=7 LATSWEEP_TEST_FUZZ_MUTANTS=20000.
    private static readonly int Seed = FromEnvironment("LATSWEEP_TEST_FUZZ_SEED", 20240301);
    private static readonly int Mutants = FromEnvironment("LATSWEEP_TEST_FUZZ_MUTANTS", 1200);

    /// <summary>Largest point (estimated floating-point operations) that a valid mutant also solves.</summary>
    private const double SolveFlopLimit = 1e7;

    /// <summary>How many of the solved mutants may have a bulk sample.</summary>
    private const int BulkSolvesAtMost = 5;

    /// <summary>How many valid mutants are solved (solving dominates the run time; binding is checked for all).</summary>
    private const int SolveAtMost = 40;

    private readonly TempFolder _dir = new();
    private readonly ITestOutputHelper _output;

    public JobFileFuzzTests(ITestOutputHelper output)
    {
        _output = output;
        // Mutants sit where the examples do, so a candidates file named relative to them is found.
        var candidates = Path.Combine(Support.Cli.JobsFolder, "candidates");
        Directory.CreateDirectory(_dir.Combine("candidates"));
        foreach (var file in Directory.GetFiles(candidates))
        {
            File.Copy(file, _dir.Combine("candidates", Path.GetFileName(file)));
        }
    }

    public void Dispose() => _dir.Dispose();

    private static int FromEnvironment(string variable, int fallback) =>
        int.TryParse(Environment.GetEnvironmentVariable(variable), System.Globalization.NumberStyles.Integer, System.Globalization.CultureInfo.InvariantCulture, out var v) ? v : fallback;

    private static IReadOnlyList<string> Examples() =>
        [.. Directory.GetFiles(Support.Cli.JobsFolder, "*.toml").Order(StringComparer.Ordinal).Select(File.ReadAllText)];

    [Fact]
    public async Task Mutated_example_jobs_end_in_a_located_message_or_a_correct_plan()
    {
        var mutator = new JobFileMutator(Seed, Examples());
        var defects = new List<string>();
        int valid = 0, rejected = 0, solved = 0;
        var clock = System.Diagnostics.Stopwatch.StartNew();
        for (var i = 0; i < Mutants; i++)
        {
            var text = mutator.Next(out var source, out var applied);
            var path = _dir.Combine($"mutant-{i:D4}.toml");
            File.WriteAllText(path, text);
            var what = $"mutant {i} ({source}: {string.Join(", ", applied)}) in {path}";
            var solve = solved < SolveAtMost;
            var work = Task.Run(() => Check(path, solve));
            if (await Task.WhenAny(work, Task.Delay(TimeSpan.FromSeconds(30))) != work)
            {
                defects.Add($"{what}: no answer within 30 s\n--- the mutant:\n{(text.Length > 4000 ? text[..4000] + "..." : text)}\n---");
                break;
            }

            var outcome = await work;
            switch (outcome.Kind)
            {
                case OutcomeKind.Valid:
                    valid++;
                    solved += outcome.Solved ? 1 : 0;
                    File.Delete(path);
                    break;
                case OutcomeKind.Rejected:
                    rejected++;
                    File.Delete(path);
                    break;
                default:
                    defects.Add($"{what}: {outcome.Detail}\n--- the mutant:\n{(text.Length > 4000 ? text[..4000] + "..." : text)}\n---");
                    break;
            }
        }

        _output.WriteLine($"{Mutants} mutants: {rejected} rejected, {valid} planned ({solved} of them solved), {defects.Count} not handled; {clock.Elapsed.TotalSeconds:F1} s, of which solving {_solveClock.Elapsed.TotalSeconds:F1} s");
        Assert.True(defects.Count == 0, $"{defects.Count} mutants were not handled:\n" + string.Join("\n", defects.Take(5)));

        // The mutants exercise both sides: many are rejected, a fair number still plan and solve.
        Assert.True(rejected > Mutants / 3, $"only {rejected} mutants were rejected");
        Assert.True(valid > Mutants / 20, $"only {valid} mutants still planned");
        Assert.True(solved >= SolveAtMost / 2, $"only {solved} valid mutants were solved");
    }

    [Fact]
    public void A_handful_of_mutants_through_the_real_executable_end_in_exit_0_or_2_without_a_stack_trace()
    {
        var mutator = new JobFileMutator(Seed + 1, Examples());
        var codes = new List<int>();
        for (var i = 0; i < 6; i++)
        {
            var text = mutator.Next(out var source, out var applied);
            var path = _dir.Combine($"process-mutant-{i}.toml");
            File.WriteAllText(path, text);
            using var check = LatsweepProcess.Start($"check {i}", _dir.Path, null, "check", path);
            Assert.True(check.WaitForExit(TimeSpan.FromSeconds(60)), check.Output);
            var what = $"mutant {i} ({source}: {string.Join(", ", applied)}):\n{check.Output}";
            Assert.True(check.ExitCode is 0 or 2, what);
            Assert.DoesNotContain("   at ", check.Stderr, StringComparison.Ordinal);
            Assert.DoesNotContain("unexpected error", check.Stderr, StringComparison.Ordinal);
            if (check.ExitCode == 2)
            {
                Assert.StartsWith("latsweep: " + path, check.Stderr.TrimStart(), StringComparison.Ordinal); // every command reports bad input alike
            }

            codes.Add(check.ExitCode);
        }

        Assert.Contains(2, codes);
    }

    private readonly System.Diagnostics.Stopwatch _solveClock = new();
    private int _bulkSolves;

    private enum OutcomeKind
    {
        Valid,
        Rejected,
        Defect,
    }

    private sealed record Outcome(OutcomeKind Kind, string Detail = "", bool Solved = false);

    /// <summary>The check command as the command line runs it, then the planner, binder and (small models) the solver.</summary>
    private Outcome Check(string path, bool solve)
    {
        var stdout = new StringWriter();
        var stderr = new StringWriter();
        int code;
        try
        {
            code = CliApp.Run(["check", path], new CliContext { Stdout = stdout, Stderr = stderr, CurrentDirectory = _dir.Path });
        }
        catch (Exception ex)
        {
            return new Outcome(OutcomeKind.Defect, "check crashed: " + ex);
        }

        if (stderr.ToString().Contains("   at ", StringComparison.Ordinal))
        {
            return new Outcome(OutcomeKind.Defect, "stack trace on stderr: " + stderr);
        }

        if (code == ExitCodes.BadInput && stdout.ToString().Contains("will fail: fix the job file", StringComparison.Ordinal))
        {
            return EveryPointFails(path);
        }

        if (code == ExitCodes.BadInput)
        {
            return Rejected(path, stderr.ToString());
        }

        if (code != ExitCodes.Ok)
        {
            return new Outcome(OutcomeKind.Defect, $"exit code {code}: {stderr}");
        }

        return RunsCorrectly(path, solve);
    }

    /// <summary>check's forecast said every point will fail (exit 2): the file loads, and its first point really fails with a model reason.</summary>
    private static Outcome EveryPointFails(string path)
    {
        try
        {
            var plan = JobFileLoader.Load(path);
            var request = PointBinder.Bind(plan, plan.Points[0]);
            PhononSolver.PreflightPoint(request.Model, request.Sample, request.Options);
            PhononSolver.PreflightModel(request.Model);
            return new Outcome(OutcomeKind.Defect, "check said every point will fail, but the first point passes the Engine's pre-flight");
        }
        catch (ModelException)
        {
            return new Outcome(OutcomeKind.Rejected);
        }
        catch (Exception e)
        {
            return new Outcome(OutcomeKind.Defect, "check said every point will fail, and loading or binding crashed: " + e);
        }
    }

    /// <summary>Every problem names the file and a line or a key, and the message shows each of them.</summary>
    private static Outcome Rejected(string path, string stderr)
    {
        JobFileException ex;
        try
        {
            JobFileLoader.Load(path);
            return new Outcome(OutcomeKind.Defect, "check said bad input but the file loads: " + stderr);
        }
        catch (JobFileException e)
        {
            ex = e;
        }
        catch (Exception e)
        {
            return new Outcome(OutcomeKind.Defect, "loading crashed: " + e);
        }

        var problems = new StringBuilder();
        if (ex.Problems.Count == 0)
        {
            problems.Append("no problem listed; ");
        }

        foreach (var p in ex.Problems)
        {
            // Located in the job file, or in a file it names (a candidates table) with its line.
            var inJob = p.File == path && (p.Line > 0 || !string.IsNullOrEmpty(p.Key));
            var inNamedFile = p.File != path && File.Exists(p.File) && p.Line > 0;
            if (!(inJob || inNamedFile) || string.IsNullOrWhiteSpace(p.Message))
            {
                problems.Append($"not located: '{p}'; ");
            }

            if (!stderr.Contains(p.ToString(), StringComparison.Ordinal))
            {
                problems.Append($"not shown: '{p}'; ");
            }
        }

        return problems.Length == 0 ? new Outcome(OutcomeKind.Rejected) : new Outcome(OutcomeKind.Defect, problems.ToString());
    }

    /// <summary>A valid mutant: its points bind to models (or fail with a model reason), and a small first point solves.</summary>
    private Outcome RunsCorrectly(string path, bool solve)
    {
        try
        {
            var plan = JobFileLoader.Load(path);
            if (plan.Points.Length == 0)
            {
                return new Outcome(OutcomeKind.Defect, "a valid plan without points");
            }

            var solved = !solve;
            foreach (var point in plan.Points.Take(3))
            {
                try
                {
                    var request = PointBinder.Bind(plan, point);
                    var estimate = PhononSolver.Estimate(request.Model, request.Sample, request.Options);
                    // Bulk meshes cost far more per estimated operation than finite crystals: solve only a few.
                    var bulk = request.Sample is LatticeSweep.Engine.Samples.BulkSample;
                    if (!solved && estimate.FlopEstimate < SolveFlopLimit && (!bulk || Interlocked.Increment(ref _bulkSolves) <= BulkSolvesAtMost))
                    {
                        using var timeout = new CancellationTokenSource(TimeSpan.FromSeconds(20));
                        _solveClock.Start();
                        var result = PhononSolver.Solve(request.Model, request.Sample, request.Options, timeout.Token);
                        _solveClock.Stop();
                        // An unstable model reports itself and leaves its thermal numbers empty (NaN) by design.
                        if (result.Summary.Stable && result.Thermal.Any(t => double.IsNaN(t.HeatCapacityJPerMolK)))
                        {
                            return new Outcome(OutcomeKind.Defect, $"point {point.PointId} is stable but solved to a NaN heat capacity");
                        }

                        solved = true;
                    }
                }
                catch (ModelException)
                {
                    // The point fails with its reason when it runs: a correct outcome.
                }
            }

            return new Outcome(OutcomeKind.Valid, Solved: solve && solved);
        }
        catch (Exception ex)
        {
            return new Outcome(OutcomeKind.Defect, "a valid job failed to plan, bind or solve: " + ex);
        }
    }
}
