using System.Reflection;
using LatticeSweep.Engine.Models;

namespace LatticeSweep.Engine.Tests.Conventions;

/// <summary>
/// The Engine's hot kernels carry <c>[MethodImpl(MethodImplOptions.AggressiveOptimization)]</c>
/// (DEVELOPERS.md, "Hot kernels"): the runtime then skips their precompiled code and tier 0 and
/// compiles them once, fully optimised, on the first call, so a fresh `latsweep run` solves its first
/// points at a warmed process's speed. Each such method costs JIT time in every process, so the set
/// is kept here: a kernel added to it, or one that lost the attribute, fails until this list says so.
/// </summary>
public class HotKernelConventionTests
{
    /// <summary>Declaring type (namespace under LatticeSweep.Engine) and method name of every hot kernel.</summary>
    public static readonly string[] HotKernels =
    [
        "Dos.SimplexDosIntegrator.AccumulateTetrahedra",
        "Dos.SimplexDosIntegrator.SumOverOrbit",
        "Dos.SimplexDosIntegrator.OrbitMeanWeight",
        "Dos.LongWaveRegion.Deposit",
        "Dos.LongWaveRegion.DepositSpreadEnd",
        "Dos.LongWaveRegion.Root",
        "Dos.LongWaveRegion.AddBelowSplit",
        "Numerics.BatchTridiagonal.Reduce",
        "Numerics.BatchTridiagonal.Diagonalize",
        "Numerics.BatchTridiagonal.BackTransform",
        "Numerics.HermitianEigenSolver.Unload",
        "Numerics.HouseholderTridiagonalization.ReduceHermitian",
        "Numerics.TridiagonalQlIteration.Diagonalize",
        "Numerics.DenseProduct.Kernel",
        "Spectrum.DynamicalMatrix.AddPairToEach",
        "Spectrum.DynamicalMatrix.MakeHermitian",
        "Spectrum.DynamicalMatrix.BuildMany",
        "Spectrum.RayDispersion.Fractions",
        "Spectrum.ModeSolver.BatchChannelFractions",
    ];

    private const BindingFlags Everything =
        BindingFlags.Public | BindingFlags.NonPublic | BindingFlags.Instance | BindingFlags.Static | BindingFlags.DeclaredOnly;

    private static IEnumerable<(string Name, MethodInfo Method)> EngineMethods() =>
        typeof(CrystalModel).Assembly.GetTypes()
            .Where(t => t.FullName?.StartsWith("LatticeSweep.Engine.", StringComparison.Ordinal) == true)
            .SelectMany(t => t.GetMethods(Everything).Select(m => (Name: $"{t.FullName!["LatticeSweep.Engine.".Length..]}.{m.Name}", Method: m)));

    private static bool IsAggressivelyOptimised(MethodInfo m) =>
        (m.MethodImplementationFlags & MethodImplAttributes.AggressiveOptimization) != 0;

    [Fact]
    public void Every_listed_hot_kernel_exists_and_is_compiled_fully_optimised_from_the_first_call()
    {
        var methods = EngineMethods().ToLookup(x => x.Name, x => x.Method);
        foreach (var kernel in HotKernels)
        {
            Assert.True(methods[kernel].Any(), $"{kernel}: no such method in the Engine (renamed? update the list)");
            Assert.True(methods[kernel].All(IsAggressivelyOptimised), $"{kernel}: lost [MethodImpl(MethodImplOptions.AggressiveOptimization)]");
        }
    }

    [Fact]
    public void No_other_engine_method_is_compiled_fully_optimised_from_the_first_call()
    {
        var unlisted = EngineMethods()
            .Where(x => IsAggressivelyOptimised(x.Method) && !HotKernels.Contains(x.Name))
            .Select(x => x.Name)
            .ToList();
        Assert.Empty(unlisted);
    }

    [Fact]
    public void A_hot_kernel_is_not_also_asked_to_be_inlined()
    {
        // Aggressive optimisation keeps a method out of tiering; asking for it to be inlined as well
        // leaves its callers' compiled code to decide, which is what the attribute is meant to avoid.
        var both = EngineMethods()
            .Where(x => IsAggressivelyOptimised(x.Method)
                        && (x.Method.MethodImplementationFlags & MethodImplAttributes.AggressiveInlining) != 0)
            .Select(x => x.Name)
            .ToList();
        Assert.Empty(both);
    }
}
