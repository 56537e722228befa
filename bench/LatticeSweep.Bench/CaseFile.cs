using System.Collections.Immutable;
using System.Text.Json;
using LatticeSweep.Engine.Models;
using LatticeSweep.Engine.Springs;

namespace LatticeSweep.Bench;

/// <summary>Reads bench/cases.json, the inputs the C# harness and the NumPy peer share.</summary>
internal sealed class CaseFile
{
    private readonly JsonElement _root;

    private CaseFile(JsonElement root) => _root = root;

    public static CaseFile Load(string path)
    {
        using var stream = File.OpenRead(path);
        using var doc = JsonDocument.Parse(stream);
        return new CaseFile(doc.RootElement.Clone());
    }

    public JsonElement Section(string name) => _root.GetProperty(name);

    public ImmutableArray<double> Temperatures()
    {
        var t = _root.GetProperty("temperatures_k");
        var first = t.GetProperty("first").GetDouble();
        var last = t.GetProperty("last").GetDouble();
        var count = t.GetProperty("count").GetInt32();
        return [.. Enumerable.Range(0, count).Select(i => first + (last - first) * i / (count - 1))];
    }

    public CrystalModel Model(string name)
    {
        var m = _root.GetProperty("models").GetProperty(name);
        var a = m.GetProperty("constant_nm").GetDouble();
        var lattice = m.GetProperty("lattice").GetString() switch
        {
            "fcc" => Lattice.FaceCentredCubic(a),
            "chain" => Lattice.Chain(a),
            "sc" => Lattice.SimpleCubic(a),
            var other => throw new InvalidDataException($"cases.json: models.{name}.lattice '{other}' is not one of fcc, chain, sc"),
        };
        var sites = m.GetProperty("sites").EnumerateArray().Select(s =>
        {
            var f = s.GetProperty("fractional").EnumerateArray().Select(x => x.GetDouble()).ToArray();
            return new Site(s.GetProperty("label").GetString()!, s.GetProperty("kind").GetString()!, new Vec3(f[0], f[1], f[2]), s.GetProperty("mass_amu").GetDouble());
        }).ToList();
        var springs = m.GetProperty("springs").EnumerateArray().Select(s =>
        {
            var kinds = s.GetProperty("kinds").EnumerateArray().Select(x => x.GetString()!).ToArray();
            return new ShellSpring(kinds[0], kinds[1], s.GetProperty("shell").GetInt32(),
                s.GetProperty("longitudinal_n_per_m").GetDouble(), s.GetProperty("transverse_n_per_m").GetDouble());
        }).ToList();
        var dof = m.GetProperty("degrees_of_freedom").GetString() == "scalar" ? DegreesOfFreedom.Scalar : DegreesOfFreedom.Cartesian;
        return CrystalModel.Create(lattice, sites, springs, degreesOfFreedom: dof);
    }

    public static int[] Ints(JsonElement e) => [.. e.EnumerateArray().Select(x => x.GetInt32())];
}
