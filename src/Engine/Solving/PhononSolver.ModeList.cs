using System.Globalization;
using LatticeSweep.Engine.Spectrum;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;

namespace LatticeSweep.Engine.Solving;

public static partial class PhononSolver
{
    /// <summary>
    /// Why a finite point will list no exact modes (its <c>modes</c> rows stay empty), decided before
    /// solving it, or null when it lists them. A bulk mesh has a continuous spectrum and is not asked
    /// about here (null): the table is for finite crystals only.
    /// </summary>
    public static string? ModeListGap(CrystalModel model, Sample sample, SolveOptions options)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(options);
        switch (sample)
        {
            case FiniteSample finite:
            {
                var modes = finite.CellCount * model.BranchCount;
                return TooMany(modes, Math.Min(FiniteCrystalSolver.StoredModeLimit, options.ModeListMaxModes), options);
            }

            case RealSpaceSample real:
            {
                var crystal = CompiledCrystal.From(model);
                var ordered = real.Disorder is null;
                var (blockSites, images) = BlockSize(crystal, real, ordered);
                var n = blockSites * crystal.Components;
                if (TakesKernelPolynomial(blockSites, n, images > 1, real, options))
                {
                    return "solved by the kernel polynomial method, which resolves no single modes";
                }

                var gap = TooMany(n * images, Math.Min(RealSpaceDenseSolver.StoredModeLimit, options.ModeListMaxModes), options);
                return gap is null || ordered ? gap : gap + " in each configuration";
            }

            default:
                return null;
        }
    }

    private static string? TooMany(long modes, long limit, SolveOptions options) =>
        modes <= limit ? null
        : options.ModeListMaxModes == 0 ? "output.mode_list_max_modes = 0"
        : string.Create(CultureInfo.InvariantCulture, $"{modes:N0} modes, more than output.mode_list_max_modes = {options.ModeListMaxModes:N0}{(limit < options.ModeListMaxModes ? $" or the {limit:N0} the engine keeps" : "")}");
}
