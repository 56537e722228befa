using System.Diagnostics;
using Npgsql;

namespace LatticeSweep.Worker.Tests.Support;

/// <summary>
/// The throwaway PostgreSQL server that scripts/test.sh starts for the tests (a cluster of its own
/// in a temporary folder, on 127.0.0.1 and a free port). Tests that need it fail, not skip, when it
/// is not there: CI always runs the script.
/// </summary>
internal static class TestPostgres
{
    public const string ConnectionVariable = "LATSWEEP_TEST_PG";
    public const string BinVariable = "LATSWEEP_TEST_PG_BIN";
    public const string DataVariable = "LATSWEEP_TEST_PG_DATA";

    /// <summary>The server's connection string (Npgsql key-value form).</summary>
    public static string ConnectionString => Required(ConnectionVariable);

    /// <summary>A connection string whose store lives in <paramref name="schema"/>.</summary>
    public static string InSchema(string schema) =>
        new NpgsqlConnectionStringBuilder(ConnectionString) { SearchPath = schema }.ConnectionString;

    /// <summary>A fresh schema name, so tests on one server never see each other's queue or catalog.</summary>
    public static string NewSchema() => "t_" + Guid.NewGuid().ToString("N")[..16];

    public static void DropSchema(string schema)
    {
        using var c = new NpgsqlConnection(ConnectionString);
        c.Open();
        using var cmd = new NpgsqlCommand($"DROP SCHEMA IF EXISTS \"{schema}\" CASCADE", c);
        cmd.ExecuteNonQuery();
    }

    /// <summary>Stops the server at once, as an administrator would (<c>pg_ctl stop -m fast</c>): every connection is cut.</summary>
    public static void Stop()
    {
        // The options the script started it with, to start it the same way again.
        _startOptions = StartOptions();
        RunPgCtl($"'{Bin("pg_ctl")}' -D '{Data}' -m fast -w stop");
    }

    /// <summary>Starts the server again with the options it had (<c>pg_ctl start</c>) and waits until it accepts connections.</summary>
    public static void Start()
    {
        var options = _startOptions ?? StartOptions();
        var log = Path.Combine(Path.GetDirectoryName(Data.TrimEnd('/'))!, "server.log");
        RunPgCtl($"'{Bin("pg_ctl")}' -D '{Data}' -l '{log}' -w -o '{options}' start");
    }

    private static string? _startOptions;

    private static string Data => Required(DataVariable);

    private static string Bin(string program) => Path.Combine(Required(BinVariable), program);

    private static string Required(string variable) =>
        Environment.GetEnvironmentVariable(variable) is { Length: > 0 } value
            ? value
            : throw new InvalidOperationException(
                $"{variable} is not set: the PostgreSQL tests need the throwaway server that scripts/test.sh starts. Run the tests with 'bash scripts/test.sh' (or source its setup part and export {ConnectionVariable}, {BinVariable} and {DataVariable}).");

    /// <summary>Throws with the message above when the server is not configured (call first in every PostgreSQL test).</summary>
    public static void Require()
    {
        _ = ConnectionString;
        _ = Data;
        _ = Required(BinVariable);
    }

    /// <summary>The server's command-line options after <c>-D dir</c>, from postmaster.opts (written by the running server).</summary>
    private static string StartOptions()
    {
        var text = File.ReadAllText(Path.Combine(Data, "postmaster.opts")).Trim();
        var args = text.Split(" \"", StringSplitOptions.None).Skip(1).Select(a => "\"" + a).ToList();
        var rest = new List<string>();
        for (var i = 0; i < args.Count; i++)
        {
            if (args[i] == "\"-D\"")
            {
                i++;
                continue;
            }

            rest.Add(args[i]);
        }

        return string.Join(' ', rest);
    }

    /// <summary>pg_ctl must not run as root: as root (CI) it runs as the postgres user, as the script does.</summary>
    private static void RunPgCtl(string command)
    {
        var asRoot = Environment.UserName == "root";
        var info = new ProcessStartInfo(asRoot ? "su" : "bash") { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        if (asRoot)
        {
            foreach (var a in new[] { "postgres", "-s", "/bin/bash", "-c", command })
            {
                info.ArgumentList.Add(a);
            }
        }
        else
        {
            info.ArgumentList.Add("-c");
            info.ArgumentList.Add(command);
        }

        using var p = Process.Start(info)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(60_000))
        {
            p.Kill(entireProcessTree: true);
            throw new InvalidOperationException($"pg_ctl did not finish in 60 s: {command}");
        }

        if (p.ExitCode != 0)
        {
            throw new InvalidOperationException($"pg_ctl failed ({p.ExitCode}): {command}\n{stdout.Result}\n{stderr.Result}");
        }
    }
}
