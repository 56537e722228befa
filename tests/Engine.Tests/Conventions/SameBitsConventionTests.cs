using System.Text.RegularExpressions;

namespace LatticeSweep.Engine.Tests.Conventions;

/// <summary>
/// The Engine calls no library routine whose rounding or order of operations is left to the
/// runtime's compiler (DEVELOPERS.md, "Same bits at every JIT tier"): the vector math functions
/// (their polynomials use a multiply-add that is fused or not by tier), the "estimate" operations,
/// and the lane sums and dot products (their order is the runtime's). They are wrapped in
/// Numerics/Simd (<c>LaneSinCos</c>, <c>LaneSums</c>) with the operations written out.
/// <see cref="Determinism.SameBitsTests"/> checks the numbers themselves; this check names the call.
/// </summary>
public partial class SameBitsConventionTests
{
    [GeneratedRegex(@"\bVector(64|128|256|512)?\s*\.\s*(Sin|Cos|SinCos|Tan|Exp|Exp2|Exp10|Log|Log2|Log10|Hypot|Pow|Cbrt|Sum|Dot|MultiplyAddEstimate|Lerp|DegreesToRadians|RadiansToDegrees)\s*\(")]
    private static partial Regex VectorMath();

    [GeneratedRegex(@"\b(Math|double|Double)\s*\.\s*(MultiplyAddEstimate|ReciprocalEstimate|ReciprocalSqrtEstimate)\s*\(|\bTensorPrimitives\b|\bVector<double>")]
    private static partial Regex ScalarEstimates();

    [GeneratedRegex(@"//.*$", RegexOptions.Multiline)]
    private static partial Regex LineComment();

    [Fact]
    public void The_engine_calls_no_library_math_whose_bits_depend_on_the_compiler()
    {
        var engine = Path.Combine(RepositoryRoot(), "src", "Engine");
        var files = Directory.EnumerateFiles(engine, "*.cs", SearchOption.AllDirectories)
            .Where(f => !f.Contains($"{Path.DirectorySeparatorChar}obj{Path.DirectorySeparatorChar}", StringComparison.Ordinal)
                        && !f.Contains($"{Path.DirectorySeparatorChar}bin{Path.DirectorySeparatorChar}", StringComparison.Ordinal))
            .ToList();
        Assert.True(files.Count > 100, $"only {files.Count} source files under {engine}");

        var found = new List<string>();
        foreach (var file in files)
        {
            var code = LineComment().Replace(File.ReadAllText(file), "");
            foreach (Match m in VectorMath().Matches(code).Concat(ScalarEstimates().Matches(code)))
            {
                found.Add($"{Path.GetRelativePath(engine, file)}: {m.Value}");
            }
        }

        Assert.Empty(found);
    }

    [Theory]
    [InlineData("var s = Vector512.SinCos(x);")]
    [InlineData("sum = Vector256.Sum(acc0 + acc1);")]
    [InlineData("var y = Vector256.MultiplyAddEstimate(a, b, c);")]
    [InlineData("var y = Math.ReciprocalEstimate(a);")]
    public void The_check_finds_such_a_call(string line)
    {
        Assert.True(VectorMath().IsMatch(line) || ScalarEstimates().IsMatch(line));
        Assert.DoesNotMatch(VectorMath(), LineComment().Replace("// " + line, ""));
    }

    private static string RepositoryRoot()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "Batch.sln")))
        {
            dir = dir.Parent;
        }

        return dir?.FullName ?? throw new InvalidOperationException("Batch.sln not found above the test output folder");
    }
}
