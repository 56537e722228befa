using System.Globalization;
using LatticeSweep.Engine.Errors;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Engine.Transport;

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
        if (s.Kind == SampleKind.Finite && s.Cells.IsEmpty && s.LengthNm.IsEmpty && s.RealSpace?.Shape != "sphere")
        {
            return "a finite sample needs sample.cells or sample.length_nm";
        }

        if (s.Kind == SampleKind.Finite && s.RealSpace is not null && RealSpaceProblem(spec) is { } wrong)
        {
            return wrong;
        }

        if (s.Kind == SampleKind.Bulk && s.Mesh.IsEmpty)
        {
            return "a bulk sample needs sample.mesh";
        }

        if (spec.Conductivity is { } c && s.Kind == SampleKind.Bulk)
        {
            if (c.Boundary is { LengthNm: null })
            {
                return "a bulk sample has no size: output.conductivity.boundary needs length_nm";
            }

            if (s.Mesh.Min() < ConductivityLimits.MinimumMesh)
            {
                return $"conductivity needs sample.mesh >= {I(ConductivityLimits.MinimumMesh)} per direction, got {I(s.Mesh.Min())}";
            }
        }

        return null;
    }

    /// <summary>The Engine's own checks of a sample with boundaries, a shape or disorder (a radius below one cell, a sphere made periodic, ...).</summary>
    private static string? RealSpaceProblem(BoundSpec spec)
    {
        try
        {
            var model = EngineObjects.BuildModel(spec.Model);
            if (EngineObjects.BuildSample(spec.Sample, model.Lattice) is RealSpaceSample sample && sample.Problems(model) is { Count: > 0 } problems)
            {
                return problems[0].ToString();
            }
        }
        catch (ModelException e)
        {
            // A model problem is the point's to report when it runs; a sample problem is reported here.
            return e.Problems.FirstOrDefault(p => p.Where.StartsWith("sample", StringComparison.Ordinal))?.ToString();
        }

        return null;
    }

    private static string I(int v) => v.ToString(CultureInfo.InvariantCulture);
}
