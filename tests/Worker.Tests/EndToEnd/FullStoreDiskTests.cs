using System.Diagnostics;
using LatticeSweep.Worker.Tests.Support;
using Xunit.Abstractions;

namespace LatticeSweep.Worker.Tests.EndToEnd;

/// <summary>
/// A store on a full disk: every command says so plainly and exits 2 (no exception names, no stack
/// trace, no endless retrying), nothing in the store is lost, and with room again the same commands
/// continue. Where the test can get one, the disk is real: a 16 MiB tmpfs mounted in a private mount
/// namespace (<c>unshare</c>, as root or through a user namespace) and filled with a file. Where it
/// cannot (a container without those privileges), the documented seam
/// <c>LATSWEEP_TEST_STORE_DISK_FULL=1</c> makes the catalog's writes fail as SQLite does on a full disk.
/// </summary>
[Collection(RealStoresCollection.Name)]
public sealed class FullStoreDiskTests : IDisposable
{
    private const string Message = "cannot be written: its disk is full";
    private readonly TempFolder _dir = new();
    private readonly ITestOutputHelper _output;

    public FullStoreDiskTests(ITestOutputHelper output)
    {
        _output = output;
    }

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void Commands_on_a_store_whose_disk_is_full_exit_2_with_one_plain_message_and_continue_once_there_is_room()
    {
        var wrapper = MountNamespace();
        var mode = wrapper is null ? "seam" : "tmpfs";
        _output.WriteLine(wrapper is null
            ? "no private mount namespace here: using the LATSWEEP_TEST_STORE_DISK_FULL seam"
            : $"a real 16 MiB tmpfs in a private mount namespace ({string.Join(' ', wrapper)})");
        Directory.CreateDirectory(_dir.Combine("store"));
        File.WriteAllText(_dir.Combine("first.toml"), Job("first-sweep"));
        File.WriteAllText(_dir.Combine("second.toml"), Job("second-sweep"));
        File.WriteAllText(_dir.Combine("scenario.sh"), Scenario);

        string[] command = [.. wrapper ?? [], "bash", "scenario.sh"];
        var info = new ProcessStartInfo(command[0]) { WorkingDirectory = _dir.Path, UseShellExecute = false };
        foreach (var a in command[1..])
        {
            info.ArgumentList.Add(a);
        }

        info.Environment["MODE"] = mode;
        info.Environment["DLL"] = Support.Cli.Dll;
        info.Environment["LATSWEEP_MAX_CHUNK_POINTS"] = "1"; // many chunks: many store writes while working
        using (var scenario = Process.Start(info)!)
        {
            Assert.True(scenario.WaitForExit(TimeSpan.FromMinutes(10)), "the scenario did not finish");
            Assert.True(scenario.ExitCode == 0, $"the scenario stopped with {scenario.ExitCode} ({Step("mount").Error})");
        }

        Step("submit-first").Succeeded();

        // Disk full: submit, status (which cannot even open the store when its files cannot grow) and work.
        var submit = Step("submit-second");
        submit.ExitsWithTheMessage();
        Assert.Contains("running or submitting the same job again", submit.Error, StringComparison.Ordinal);
        if (mode == "tmpfs")
        {
            Step("status-full").ExitsWithTheMessage();
            Assert.Matches(@"\((\d+ bytes|[\d.]+ KiB) free on its file system\)", submit.Error);
        }

        Step("work-full").ExitsWithTheMessage();

        // Room again: the refused sweep is submitted, both are worked to the end, nothing was lost.
        Step("submit-second-again").Succeeded();
        var work = Step("work-room");
        work.Succeeded();
        Assert.Contains("The queue is empty. Points failed here: 0; unstable models: 0.", work.Output, StringComparison.Ordinal);
        Assert.Contains("State      done", Step("status-first").Output, StringComparison.Ordinal);
        Assert.Contains("8 done, 0 unstable, 0 failed", Step("status-first").Output, StringComparison.Ordinal);
        Assert.Contains("8 done, 0 unstable, 0 failed", Step("status-second").Output, StringComparison.Ordinal);
    }

    /// <summary>The scenario, in one shell so that a tmpfs mounted in its private namespace lasts through every step.</summary>
    private const string Scenario = """
        set -u
        step() { name=$1; shift; timeout 300 dotnet exec "$DLL" "$@" >"$name.out" 2>"$name.err"; echo $? >"$name.rc"; }
        # full KIB: leave about KIB KiB free (tmpfs), or switch the seam on
        full() {
          if [ "$MODE" = tmpfs ]; then
            rm -f store/filler
            avail=$(df -k --output=avail store | tail -1)
            dd if=/dev/zero of=store/filler bs=1k count=$(( avail > $1 ? avail - $1 : 0 )) 2>/dev/null
          else
            export LATSWEEP_TEST_STORE_DISK_FULL=1
          fi
        }
        room() { rm -f store/filler; unset LATSWEEP_TEST_STORE_DISK_FULL; }
        if [ "$MODE" = tmpfs ]; then
          mount -t tmpfs -o size=16m latsweep-test store 2>mount.err || exit 97
        fi
        step submit-first submit first.toml --store store/s.db --out out
        full 0
        step submit-second submit second.toml --store store/s.db --out out
        step status-full status --store store/s.db
        full 48
        step work-full work --store store/s.db --workers 1
        room
        step submit-second-again submit second.toml --store store/s.db --out out
        step work-room work --store store/s.db --workers 1
        step status-first status first-sweep --store store/s.db
        step status-second status second-sweep --store store/s.db
        exit 0
        """;

    private static string Job(string name) => Some.ChainJob(sweep: "[[sweep.axes]]\npath = \"model.sites.B.mass_amu\"\nvalues = [12, 14, 16, 18, 20, 22, 24, 26]")
        .Replace("name = \"test-chain\"", $"name = \"{name}\"", StringComparison.Ordinal);

    /// <summary>
    /// The command prefix that gives a private mount namespace in which tmpfs can be mounted, or null:
    /// plain <c>unshare --mount</c> (root with the privilege to mount), else a user namespace.
    /// </summary>
    private string[]? MountNamespace()
    {
        // LATSWEEP_TEST_STORE_SEAM_ONLY=1 runs the seam path on a machine that could mount (to check it there).
        if (!File.Exists("/usr/bin/unshare") || !OperatingSystem.IsLinux() || Environment.GetEnvironmentVariable("LATSWEEP_TEST_STORE_SEAM_ONLY") == "1")
        {
            return null;
        }

        string[][] candidates = [["unshare", "--mount", "--propagation", "private"], ["unshare", "--user", "--map-root-user", "--mount", "--propagation", "private"]];
        foreach (var prefix in candidates)
        {
            var probe = _dir.Combine("probe");
            Directory.CreateDirectory(probe);
            var info = new ProcessStartInfo(prefix[0]) { UseShellExecute = false, RedirectStandardError = true, RedirectStandardOutput = true };
            foreach (var a in prefix[1..].Concat(["sh", "-c", $"mount -t tmpfs -o size=64k probe '{probe}'"]))
            {
                info.ArgumentList.Add(a);
            }

            using var p = Process.Start(info)!;
            p.WaitForExit();
            Directory.Delete(probe);
            if (p.ExitCode == 0)
            {
                return prefix;
            }
        }

        return null;
    }

    private StepResult Step(string name)
    {
        string Read(string extension) => File.Exists(_dir.Combine(name + extension)) ? File.ReadAllText(_dir.Combine(name + extension)) : "";
        var rc = Read(".rc").Trim();
        return new StepResult(name, rc.Length == 0 ? -1 : int.Parse(rc, System.Globalization.CultureInfo.InvariantCulture), Read(".out"), Read(".err"));
    }

    private sealed record StepResult(string Name, int ExitCode, string Output, string Error)
    {
        private string All => $"--- {Name}: exit {ExitCode}\n{Output}\n--- stderr:\n{Error}";

        public void Succeeded() => Assert.True(ExitCode == 0, All);

        public void ExitsWithTheMessage()
        {
            Assert.True(ExitCode == 2, All);
            var last = Error.ReplaceLineEndings("\n").TrimEnd('\n').Split('\n')[^1];
            Assert.StartsWith("latsweep: the store ", last, StringComparison.Ordinal);
            Assert.Contains(Message, last, StringComparison.Ordinal);
            Assert.DoesNotContain("Exception", Output + Error, StringComparison.Ordinal);
            Assert.DoesNotContain("   at ", Output + Error, StringComparison.Ordinal);
            Assert.DoesNotContain("unexpected error", Error, StringComparison.Ordinal);
        }
    }
}
