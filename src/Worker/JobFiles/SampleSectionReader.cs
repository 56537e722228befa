using System.Collections.Immutable;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Samples;
using LatticeSweep.Worker.Planning.Specs;

namespace LatticeSweep.Worker.JobFiles;

/// <summary>
/// Reads <c>[sample]</c>: a finite crystal (<c>cells</c> or <c>length_nm</c>) or the bulk limit
/// (<c>mesh</c>). A single number means the same in every lattice direction. A finite sample may
/// add free boundaries, a cut shape, disorder and solver settings (<see cref="RealSpaceSpec"/>).
/// </summary>
internal static partial class SampleSectionReader
{
    public const int MaxCellsPerDirection = 1_000_000;
    public const int MaxMeshPerDirection = 100_000;

    private static string[] Keys => ["kind", "cells", "length_nm", "mesh", .. RealSpaceKeys];
    private static readonly string[] Kinds = ["finite", "bulk"];

    /// <param name="kindSwept">When <c>sample.kind</c> is a sweep axis, both the finite and the bulk keys are needed.</param>
    public static SampleSpec? Read(TableReader? t, int dimension, bool kindSwept)
    {
        if (t is null)
        {
            return null;
        }

        var before = t.Problems.Count;
        t.RejectUnknown(Keys);
        var kindName = t.String("kind", required: true, allowed: Kinds);
        var kind = kindName == "bulk" ? SampleKind.Bulk : SampleKind.Finite;
        var needFinite = kindSwept || kind == SampleKind.Finite;
        var needBulk = kindSwept || kind == SampleKind.Bulk;

        var cells = ImmutableArray<int>.Empty;
        var lengths = ImmutableArray<double>.Empty;
        var mesh = ImmutableArray<int>.Empty;
        var realSpace = ReadRealSpace(t, dimension, kind, kindSwept);
        var sphere = realSpace?.Shape == "sphere";
        if (sphere)
        {
            RejectForSphere(t, "cells");
            RejectForSphere(t, "length_nm");
        }

        if (needFinite && !sphere)
        {
            if (t.Has("cells") && t.Has("length_nm"))
            {
                t.Error("length_nm", "give either cells or length_nm, not both");
            }
            else if (t.Has("length_nm"))
            {
                lengths = PerDirection(t, "length_nm", dimension, t.DoubleList("length_nm", check: Checks.SampleLengthNm, allowScalar: true));
            }
            else if (t.Has("cells"))
            {
                cells = PerDirection(t, "cells", dimension, t.IntegerList("cells", 1, MaxCellsPerDirection, allowScalar: true)?.Select(n => (int)n).ToList());
            }
            else if (kindName is not null)
            {
                t.TableError($"a finite sample needs cells (per direction, e.g. cells = 64) or length_nm{(kindSwept ? " (sample.kind is swept)" : "")}");
            }
        }
        else if (!needFinite)
        {
            RejectFor(t, "cells", "bulk");
            RejectFor(t, "length_nm", "bulk");
        }

        if (needBulk)
        {
            if (t.Has("mesh"))
            {
                mesh = PerDirection(t, "mesh", dimension, t.IntegerList("mesh", 1, MaxMeshPerDirection, allowScalar: true)?.Select(n => (int)n).ToList());
            }
            else if (kindName is not null)
            {
                t.TableError($"a bulk sample needs mesh (wave vectors per direction, e.g. mesh = 24){(kindSwept ? " (sample.kind is swept)" : "")}");
            }
        }
        else
        {
            RejectFor(t, "mesh", "finite");
        }

        return t.Problems.Count > before ? null : new SampleSpec(kind, cells, lengths, mesh) { RealSpace = realSpace };
    }

    private static void RejectForSphere(TableReader t, string key)
    {
        if (t.Has(key))
        {
            t.Error(key, "a sphere's size is its shape.radius_nm; remove " + key);
        }
    }

    private static void RejectFor(TableReader t, string key, string kind)
    {
        if (t.Has(key))
        {
            t.Error(key, $"does not apply to a {kind} sample; remove it (or sweep sample.kind)");
        }
    }

    private static ImmutableArray<T> PerDirection<T>(TableReader t, string key, int dimension, IReadOnlyList<T>? values)
    {
        if (values is null)
        {
            return [];
        }

        if (values.Count == 1 && t.Raw(key) is not Tomlyn.Model.TomlArray)
        {
            return [.. Enumerable.Repeat(values[0], Math.Max(1, dimension))];
        }

        if (dimension <= 0)
        {
            // The model could not be read, so its dimension is unknown: only the values were checked.
            return [.. values];
        }

        if (values.Count != dimension)
        {
            t.Error(key, $"a {dimension}D lattice takes {dimension} value(s) (one per lattice direction) or a single number for all, got {values.Count}");
            return [];
        }

        return [.. values];
    }
}
