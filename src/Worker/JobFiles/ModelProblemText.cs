using LatticeSweep.Engine.Errors;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// The Engine's reasons for refusing a model, each at the place of the job file it names
/// (<c>FILE:LINE:COL: model.sites[1].position: ...</c>), the way every other job-file mistake is reported.
/// The Engine names its keys from the model (<c>sites[1].position</c>, <c>lattice.vectors_nm</c>); the job
/// file writes them under <c>[model]</c>. A key the file does not write (a site a builder made) is put at
/// the nearest table it does write.
/// </summary>
internal static class ModelProblemText
{
    private static readonly string[] Sections = ["sweep", "model", "sample", "output"];

    /// <summary>The job-file key path of an Engine problem's <see cref="ModelProblem.Where"/>.</summary>
    public static string JobFileKey(string where)
    {
        ArgumentNullException.ThrowIfNull(where);
        if (where.StartsWith("lattice.", StringComparison.Ordinal))
        {
            return "model." + where["lattice.".Length..];
        }

        var head = where.Split('.', '[')[0];
        return Sections.Contains(head, StringComparer.Ordinal) ? where : "model." + where;
    }

    /// <summary>Every problem of <paramref name="ex"/> on one line, each located in <paramref name="document"/>; the plain message without a document.</summary>
    public static string Of(ModelException ex, TomlDocument? document)
    {
        ArgumentNullException.ThrowIfNull(ex);
        if (document is null || ex.Problems.Count == 0)
        {
            return ex.Message.ReplaceLineEndings("; ");
        }

        return string.Join("; ", ex.Problems.Select(p =>
        {
            var key = JobFileKey(p.Where);
            var at = KeyLocator.Locate(document, key);
            return new JobFileProblem(document.File, at.Line, at.Column, key, p.Message).ToString();
        }));
    }
}
