using LatticeSweep.Dashboard.Security;
using LatticeSweep.Dashboard.Tests.Support;

namespace LatticeSweep.Dashboard.Tests.Security;

public sealed class OutputRootTests
{
    [Fact]
    public void Paths_inside_the_root_resolve_and_paths_that_leave_it_do_not()
    {
        using var temp = new TempFolder();
        var rootPath = temp.Combine("out");
        Directory.CreateDirectory(Path.Combine(rootPath, "sweep-a", "points"));
        Directory.CreateDirectory(temp.Combine("out-sibling"));
        var root = new OutputRoot(rootPath);

        Assert.Equal(Path.Combine(rootPath, "sweep-a", "points"), root.Resolve("sweep-a/points"));
        Assert.Equal(Path.Combine(rootPath, "sweep-a"), root.Resolve("sweep-a/points/.."));
        Assert.Equal(rootPath, root.Resolve(""));
        Assert.Equal(Path.Combine(rootPath, "not-yet"), root.Resolve("not-yet"));
        Assert.Null(root.Resolve(".."));
        Assert.Null(root.Resolve("../out-sibling"));
        Assert.Null(root.Resolve("sweep-a/../../out-sibling"));
        Assert.Null(root.Resolve("/etc/passwd"));
        Assert.Null(root.Resolve("..\\..\\etc"));
        Assert.Null(root.Resolve("a\0b"));
        Assert.Null(root.Contain(temp.Combine("out-sibling")));
        Assert.Null(root.Contain("relative/path"));
        Assert.Equal("sweep-a/points", root.Relative(root.Resolve("sweep-a/points")!));
    }

    [Fact]
    public void Links_are_followed_before_the_check()
    {
        using var temp = new TempFolder();
        var rootPath = temp.Combine("out");
        Directory.CreateDirectory(Path.Combine(rootPath, "sweep-a"));
        Directory.CreateDirectory(temp.Combine("elsewhere"));
        Directory.CreateSymbolicLink(Path.Combine(rootPath, "outward"), temp.Combine("elsewhere"));
        Directory.CreateSymbolicLink(Path.Combine(rootPath, "inward"), Path.Combine(rootPath, "sweep-a"));
        Directory.CreateSymbolicLink(temp.Combine("link-to-out"), rootPath);
        var root = new OutputRoot(rootPath);

        Assert.Null(root.Resolve("outward"));
        Assert.Null(root.Resolve("outward/file.txt"));
        Assert.Equal(Path.Combine(rootPath, "sweep-a", "x.parquet"), root.Resolve("inward/x.parquet"));

        // A root given through a link is the same root.
        var viaLink = new OutputRoot(temp.Combine("link-to-out"));
        Assert.Equal(rootPath, viaLink.Path);
        Assert.Equal(Path.Combine(rootPath, "sweep-a"), viaLink.Contain(Path.Combine(temp.Combine("link-to-out"), "sweep-a")));
    }

    public static TheoryData<int> ChainLengths => [1, 32, 33, 64];

    [Theory]
    [MemberData(nameof(ChainLengths))]
    public void A_chain_of_links_is_resolved_to_its_end_and_checked_there(int links)
    {
        using var temp = new TempFolder();
        var rootPath = temp.Combine("out");
        Directory.CreateDirectory(Path.Combine(rootPath, "sweep-a"));
        Directory.CreateDirectory(temp.Combine("elsewhere"));
        File.WriteAllText(Path.Combine(rootPath, "sweep-a", "inside.txt"), "in");
        File.WriteAllText(temp.Combine("elsewhere", "outside.txt"), "out");
        Chain(rootPath, "in", links, Path.Combine(rootPath, "sweep-a", "inside.txt"));
        Chain(rootPath, "out", links, temp.Combine("elsewhere", "outside.txt"));
        Chain(rootPath, "dir", links, temp.Combine("elsewhere"));
        var root = new OutputRoot(rootPath);

        Assert.Equal(Path.Combine(rootPath, "sweep-a", "inside.txt"), root.Resolve("in-1"));
        Assert.Null(root.Resolve("out-1"));
        Assert.Null(root.Resolve("dir-1/outside.txt"));
        Assert.Null(root.Contain(Path.Combine(rootPath, "out-1")));
        Assert.Equal(Path.Combine(rootPath, "sweep-a", "inside.txt"), root.Contain(Path.Combine(rootPath, "in-1")));
    }

    [Fact]
    public void A_loop_of_links_and_a_chain_longer_than_the_limit_are_refused()
    {
        using var temp = new TempFolder();
        var rootPath = temp.Combine("out");
        Directory.CreateDirectory(rootPath);
        File.WriteAllText(Path.Combine(rootPath, "inside.txt"), "in");
        File.CreateSymbolicLink(Path.Combine(rootPath, "loop-a"), Path.Combine(rootPath, "loop-b"));
        File.CreateSymbolicLink(Path.Combine(rootPath, "loop-b"), Path.Combine(rootPath, "loop-a"));
        Directory.CreateSymbolicLink(Path.Combine(rootPath, "self"), "self");
        Chain(rootPath, "long", LinkFreePath.MaxLinks + 1, Path.Combine(rootPath, "inside.txt"));
        Chain(rootPath, "longest-allowed", LinkFreePath.MaxLinks, Path.Combine(rootPath, "inside.txt"));
        var root = new OutputRoot(rootPath);

        Assert.Null(root.Resolve("loop-a"));
        Assert.Null(root.Resolve("self/x"));
        Assert.Null(root.Resolve("long-1"));
        Assert.Equal(Path.Combine(rootPath, "inside.txt"), root.Resolve("longest-allowed-1"));

        // A root that is itself a loop cannot be used at all.
        var ex = Assert.Throws<LatticeSweep.Dashboard.Hosting.DashboardStartException>(() => new OutputRoot(Path.Combine(rootPath, "loop-a")));
        Assert.Contains("--out", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Relative_links_and_links_in_the_middle_of_a_path_are_resolved_from_their_own_folder()
    {
        using var temp = new TempFolder();
        var rootPath = temp.Combine("out");
        Directory.CreateDirectory(Path.Combine(rootPath, "a", "b"));
        Directory.CreateDirectory(temp.Combine("elsewhere"));
        File.WriteAllText(Path.Combine(rootPath, "a", "b", "f.txt"), "x");
        Directory.CreateSymbolicLink(Path.Combine(rootPath, "a", "up"), "..");
        Directory.CreateSymbolicLink(Path.Combine(rootPath, "a", "b", "out"), "../../../elsewhere");
        File.CreateSymbolicLink(Path.Combine(rootPath, "a", "b", "dangling"), "../../not-there/../../elsewhere");
        var root = new OutputRoot(rootPath);

        Assert.Equal(Path.Combine(rootPath, "a", "b", "f.txt"), root.Resolve("a/up/a/up/a/b/f.txt"));
        Assert.Null(root.Resolve("a/b/out"));
        Assert.Null(root.Resolve("a/up/a/b/out/secret"));
        Assert.Null(root.Resolve("a/b/dangling"));
    }

    /// <summary>prefix-1 -> prefix-2 -> ... -> prefix-n -> target, every link absolute.</summary>
    internal static void Chain(string folder, string prefix, int links, string target)
    {
        for (var i = links; i >= 1; i--)
        {
            var link = Path.Combine(folder, $"{prefix}-{i}");
            var to = i == links ? target : Path.Combine(folder, $"{prefix}-{i + 1}");
            File.CreateSymbolicLink(link, to);
        }
    }
}
