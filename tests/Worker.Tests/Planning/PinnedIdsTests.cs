using System.Globalization;
using System.Text;
using LatticeSweep.Engine.Models;
using LatticeSweep.Worker.Planning;
using LatticeSweep.Worker.Planning.Specs;
using LatticeSweep.Worker.Tests.Support;

namespace LatticeSweep.Worker.Tests.Planning;

/// <summary>
/// Point ids and spec hashes must never change for the same point: stores and result sets written
/// by earlier versions are matched by them. The spec hash covers every id of the plan in order, so
/// pinning it pins every point of each example job; the first and last ids are pinned beside it.
/// Values as computed by the version before the planner wrote ids as UTF-8 (main at 6fff91a).
/// </summary>
public sealed class PinnedIdsTests
{
    public static TheoryData<string, string, string, string> Pinned() => new()
    {
        { "bending-nanocrystals.toml", "a20a1037b88bf5d0", "f639b8bfbe6dc5be", "03e94b0c0a4b2cf0" },
        { "film-thickness.toml", "a30a290c9e4ff23e", "0a3f1f06d933cc2b", "715801463b8504ee" },
        { "flexural-sheet.toml", "047aeae0deabc1ca", "8b75b7b802a00e0f", "4dbf54191a328e66" },
        { "isotope-mixture.toml", "b04bd97c4b22f7cb", "ce3d261d4f9e36e9", "130fbaf376364620" },
        { "layered-basis.toml", "8225d8e92e7bd346", "4f15e231331a1da6", "fbd063f44e6875ff" },
        { "nanocrystal-size.toml", "49beebf73181930e", "080d90a8be9de248", "87bfbe89c9fb14bb" },
        { "nanocrystal-surfaces.toml", "6b9ff9fa54a1a7de", "e074b2d418ac2a62", "11c014f9e58db504" },
        { "potential-expansion.toml", "8adea4e2afe0a4ce", "b05b76892ad1821e", "d52f5a56a7b14522" },
        { "quickstart.toml", "2fc0a876c69a185e", "7fc5cc5d6bdf1c7b", "1d829cf0ac32629f" },
        { "screening.toml", "5e8e0f37e075fe6c", "3161be1cca416bc5", "24cb1f36a0c4d175" },
        { "semiconductor-bending.toml", "2e15059766e7b063", "e96ddb98a8efa6d9", "60575c19a2263f27" },
        { "thin-film-size.toml", "a283defb16b00b26", "ebf91bc1d20a0b80", "34d5ff5dfaa77c62" },
    };

    [Theory]
    [MemberData(nameof(Pinned))]
    public void Example_jobs_keep_their_spec_hash_and_ids(string file, string specHash, string firstId, string lastId)
    {
        var path = Path.Combine(Some.RepositoryRoot(), "jobs", file);
        var plan = JobFileLoader.Load(path);
        Assert.Equal(specHash, plan.SpecHash);
        Assert.Equal(firstId, plan.Points.IdAt(0));
        Assert.Equal(lastId, plan.Points.IdAt(plan.Points.Count - 1));

        // A worker's lazy plan computes each id on its own: the same ids.
        var lazy = JobFileLoader.Load(path, File.ReadAllText(path), lazy: true);
        if (plan.DefinitionHash is not null)
        {
            Assert.Equal(plan.Points.Select(p => p.PointId), Enumerable.Range(0, lazy.Points.Count).Select(lazy.Points.IdAt));
        }
    }

    [Fact]
    public void The_bench_sweep_of_a_million_points_keeps_its_spec_hash()
    {
        // Every one of the 10^6 ids goes into this hash (bench/README.md has quoted it since round 1).
        var plan = JobFileLoader.Load(Path.Combine(Some.RepositoryRoot(), "bench", "queue", "million-points.toml"));
        Assert.Equal(1_000_000, plan.Points.Count);
        Assert.Equal("4d7dbadf99cf61aa", plan.SpecHash);
    }

    [Fact]
    public void The_utf8_writer_writes_the_same_text_as_the_string_forms()
    {
        var rng = new Random(20261203);
        var w = new CanonicalWriter(16, cacheNumbers: true);
        var expected = new StringBuilder();
        double[] specials = [0.0, -0.0, 1.0, -1.0, 0.1, 1e-300, 5e-324, double.Epsilon, double.MaxValue, double.MinValue, 1e21, 1e-7, 123456789012345680.0, 17.7827941004, double.NaN, double.PositiveInfinity, double.NegativeInfinity];
        var random = Enumerable.Range(0, 20_000).Select(_ => BitConverter.Int64BitsToDouble(rng.NextInt64())).ToArray();

        // Twice each, so the second time comes from the writer's cache of recent values.
        foreach (var d in specials.Concat(random).Concat(specials).Concat(random.Take(500)))
        {
            w.D(d).Append(' ');
            expected.Append(CanonicalSpec.D(d)).Append(' ');
        }

        foreach (var v in new long[] { 0, -1, long.MinValue, long.MaxValue, 42 })
        {
            w.I(v).Append(';');
            expected.Append(v.ToString(CultureInfo.InvariantCulture)).Append(';');
        }

        foreach (var s in new[] { "A", "", "a\"b", "back\\slash", "two\nlines", "Ünïcødé ✓", "\ud83d\ude00" })
        {
            w.Quote(s).Append('|');
            expected.Append(CanonicalSpec.Quote(s)).Append('|');
        }

        w.V(new Vec3(0.25, -0.5, 1e-9)).Append('é');
        expected.Append(CultureInfo.InvariantCulture, $"({CanonicalSpec.D(0.25)},{CanonicalSpec.D(-0.5)},{CanonicalSpec.D(1e-9)})").Append('é');
        Assert.Equal(Encoding.UTF8.GetBytes(expected.ToString()), w.Written.ToArray());
    }
}
