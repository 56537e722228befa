using System.Diagnostics;
using System.Runtime.InteropServices;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Cli;

/// <summary>
/// README's install line (an x86-64 ReadyToRun publish) holds the Engine precompiled twice, for AVX2 and for
/// AVX-512, and latsweep loads the one for the processor it runs on (EngineImages.targets, EngineImages.cs).
/// </summary>
public sealed class PublishedEngineImagesTests : IDisposable
{
    private readonly TempFolder _dir = new();

    public void Dispose() => _dir.Dispose();

    [Fact]
    public void A_published_build_loads_the_engine_image_for_the_processor_and_solves_as_the_plain_build()
    {
        // The two images are made for x86-64 Linux publishes only; elsewhere the Engine is one image as before.
        if (!OperatingSystem.IsLinux() || RuntimeInformation.ProcessArchitecture != Architecture.X64)
        {
            return;
        }

        var published = _dir.Combine("published");
        var publish = Run("dotnet", _dir.Path, NoSettings,
            "publish", Path.Combine(RepositoryRoot, "src", "Worker", "Worker.csproj"), "-c", "Release", "-r", "linux-x64",
            "--self-contained", "false", "-p:PublishReadyToRun=true", "--artifacts-path", _dir.Combine("build"),
            "-o", published, "-m:1", "-nologo", "-v", "quiet");
        Assert.True(publish.ExitCode == 0, publish.Output);

        // The Engine is in a folder per image and not on the list the host hands to the runtime.
        Assert.True(File.Exists(Path.Combine(published, "engine", "avx2", "LatticeSweep.Engine.dll")));
        Assert.True(File.Exists(Path.Combine(published, "engine", "avx512", "LatticeSweep.Engine.dll")));
        Assert.False(File.Exists(Path.Combine(published, "LatticeSweep.Engine.dll")));
        Assert.DoesNotContain("LatticeSweep.Engine.dll", File.ReadAllText(Path.Combine(published, "latsweep.deps.json")), StringComparison.Ordinal);
        Assert.NotEqual(
            File.ReadAllBytes(Path.Combine(published, "engine", "avx2", "LatticeSweep.Engine.dll")),
            File.ReadAllBytes(Path.Combine(published, "engine", "avx512", "LatticeSweep.Engine.dll")));

        var executable = Path.Combine(published, "latsweep");
        var avx2Only = new Dictionary<string, string> { ["DOTNET_EnableAVX512"] = "0" };
        Assert.Contains(", avx2 image,", Run(executable, _dir.Path, avx2Only, "--version").Stdout, StringComparison.Ordinal);
        Assert.Contains($", {EngineImages.FolderForThisProcessor()} image,", Run(executable, _dir.Path, NoSettings, "--version").Stdout, StringComparison.Ordinal);

        // Same summary from either image as from the plain build (tiering off: the same code all along).
        var job = Path.Combine(Support.Cli.JobsFolder, "quickstart.toml");
        foreach (var width in new[] { new Dictionary<string, string>(), avx2Only })
        {
            width["DOTNET_TieredCompilation"] = "0";
            var fromPublished = Run(executable, _dir.Path, width, "solve", job);
            var fromPlainBuild = Run("dotnet", _dir.Path, width, "exec", Support.Cli.Dll, "solve", job);
            Assert.True(fromPublished.ExitCode == 0, fromPublished.Output);
            Assert.True(fromPlainBuild.ExitCode == 0, fromPlainBuild.Output);
            Assert.Equal(fromPlainBuild.Stdout, fromPublished.Stdout);
        }
    }

    private static readonly Dictionary<string, string> NoSettings = [];

    private sealed record Finished(int ExitCode, string Stdout, string Output);

    private static Finished Run(string program, string folder, IReadOnlyDictionary<string, string> environment, params string[] args)
    {
        var info = new ProcessStartInfo(program)
        {
            WorkingDirectory = folder,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        foreach (var a in args)
        {
            info.ArgumentList.Add(a);
        }

        // A clean MSBuild for the child publish (not the test runner's), and no build server left running after it.
        foreach (var name in info.Environment.Keys.Where(k => k.StartsWith("MSBuild", StringComparison.OrdinalIgnoreCase)).ToList())
        {
            info.Environment.Remove(name);
        }

        info.Environment["MSBUILDDISABLENODEREUSE"] = "1";
        info.Environment["DOTNET_CLI_USE_MSBUILD_SERVER"] = "0";
        foreach (var (k, v) in environment)
        {
            info.Environment[k] = v;
        }

        using var process = Process.Start(info)!;
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        if (!process.WaitForExit(TimeSpan.FromMinutes(15)))
        {
            process.Kill(entireProcessTree: true);
        }

        process.WaitForExit();
        return new Finished(process.ExitCode, stdout.Result, $"{program} {string.Join(' ', args)}: exit {process.ExitCode}\n{stdout.Result}\n{stderr.Result}");
    }

    private static string RepositoryRoot => Path.GetDirectoryName(Support.Cli.JobsFolder)!;
}
