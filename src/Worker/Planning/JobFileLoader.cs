using System.Collections.Immutable;
using LatticeSweep.Worker.JobFiles;

namespace LatticeSweep.Worker.Planning;

/// <summary>Reads a job file, validates it and expands its sweep into a <see cref="SweepPlan"/>.</summary>
public static class JobFileLoader
{
    /// <summary>Throws <see cref="JobFileException"/> listing every problem, located.</summary>
    public static SweepPlan Load(string path)
    {
        ArgumentNullException.ThrowIfNull(path);
        return Load(path, JobFileText.Read(path));
    }

    /// <summary>Plans job-file text; <paramref name="path"/> names it in messages and anchors relative candidate files.</summary>
    internal static SweepPlan Load(string path, string text) => Load(path, text, lazy: false);

    /// <summary>Plans job-file text; <paramref name="lazy"/>: ids computed when asked for (see <see cref="SweepPlanner.Plan(TomlDocument, string, ProblemCollector, bool)"/>).</summary>
    internal static SweepPlan Load(string path, string text, bool lazy)
    {
        var problems = new ProblemCollector(path);
        var document = TomlDocument.Parse(text, path, problems);
        if (document is null)
        {
            problems.ThrowIfAny();
            throw new JobFileException(new JobFileProblem(path, 0, 0, "", "the file could not be read as TOML"));
        }

        return SweepPlanner.Plan(document, text, problems, lazy);
    }
}
