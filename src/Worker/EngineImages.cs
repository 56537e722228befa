using System.Reflection;
using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;
using System.Runtime.Loader;

namespace LatticeSweep.Worker;

/// <summary>
/// Loads the Engine's precompiled image made for this processor in an x86-64 ReadyToRun publish, where the Engine
/// is not beside latsweep.dll but in <c>engine/avx512/</c> and <c>engine/avx2/</c> (EngineImages.targets). The
/// runtime keeps precompiled code only where the processor matches what it was compiled for, so the 512-bit kernels
/// are precompiled only in the AVX-512 image, and that image would be rejected whole on an AVX2-only processor.
/// In a plain build the Engine is beside latsweep.dll, the runtime binds it there and this handler never runs.
/// </summary>
internal static class EngineImages
{
    private const string EngineName = "LatticeSweep.Engine";

    /// <summary>The folder under <c>engine/</c> the Engine was loaded from; null in a plain build (or before it loaded).</summary>
    public static string? LoadedFolder { get; private set; }

    /// <summary>Must run before any Engine type is touched (first thing in <c>Main</c>).</summary>
    public static void LoadFromPublishedFolders()
    {
        AssemblyLoadContext.Default.Resolving += Resolve;
    }

    /// <summary>The folder under <c>engine/</c> whose image this processor runs precompiled.</summary>
    internal static string FolderForThisProcessor() => Avx512ImageRuns() ? "avx512" : "avx2";

    /// <summary>
    /// True where the AVX-512 image's code is kept: AVX-512 F, BW, CD, DQ and VL enabled in .NET (not hidden by
    /// <c>DOTNET_EnableAVX512=0</c>), 512-bit vectors preferred by .NET (not the older processors it keeps at
    /// 256 bits), and no AVX10, which the image is compiled as absent. Elsewhere the AVX2 image: its code is kept on
    /// AVX2 processors and rejected, the Engine then JIT'd with the same results, on processors without AVX2.
    /// </summary>
    internal static bool Avx512ImageRuns() =>
        Avx512F.IsSupported && Avx512F.VL.IsSupported && Avx512BW.IsSupported && Avx512CD.IsSupported
        && Avx512DQ.IsSupported && Vector512.IsHardwareAccelerated && !Avx10v1.IsSupported;

    private static Assembly? Resolve(AssemblyLoadContext context, AssemblyName name)
    {
        if (name.Name != EngineName)
        {
            return null;
        }
        var engineFolder = Path.Combine(AppContext.BaseDirectory, "engine");
        foreach (var folder in new[] { FolderForThisProcessor(), "avx2" })
        {
            var path = Path.Combine(engineFolder, folder, EngineName + ".dll");
            if (File.Exists(path))
            {
                LoadedFolder = folder;
                return context.LoadFromAssemblyPath(path);
            }
        }
        return null;
    }
}
