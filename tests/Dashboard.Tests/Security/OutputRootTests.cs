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
}
