using System.Globalization;

namespace LatticeSweep.Worker.Planning.Specs;

/// <summary>
/// Checks that involve more than one field, run on every point at plan time so that no point is
/// queued that is bound to fail on its input. Physics problems (an unstable model, overlapping
/// sites) are the Engine's to find when the point runs.
/// </summary>
internal static class SpecChecks
{
    /// <summary>What is wrong with this combination of values, or null.</summary>
    public static string? Check(BoundSpec spec)
    {
        if (spec.Model is LayeredSpec { CountA: { } a } l && a > l.SitesPerCell)
        {
            return $"model.layers.count_a ({I(a)}) exceeds model.layers.sites_per_cell ({I(l.SitesPerCell)})";
        }

        var s = spec.Sample;
        if (s.Kind == SampleKind.Finite && s.Cells.IsEmpty && s.LengthNm.IsEmpty)
        {
            return "a finite sample needs sample.cells or sample.length_nm";
        }

        if (s.Kind == SampleKind.Bulk && s.Mesh.IsEmpty)
        {
            return "a bulk sample needs sample.mesh";
        }

        return null;
    }

    private static string I(int v) => v.ToString(CultureInfo.InvariantCulture);
}
