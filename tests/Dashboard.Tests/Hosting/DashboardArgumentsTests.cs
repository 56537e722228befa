using System.Net;
using LatticeSweep.Dashboard.Hosting;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Dashboard.Tests.Hosting;

public sealed class DashboardArgumentsTests
{
    private const string Here = "/work/here";

    private static DashboardOptions Parse(params string[] args) => DashboardArguments.Parse(args, Here, _ => null);

    [Fact]
    public void Defaults_are_loopback_port_5080_the_default_store_and_no_token()
    {
        var o = Parse("--out", "results");
        Assert.Equal(IPAddress.Loopback, o.BindAddress);
        Assert.Equal(5080, o.Port);
        Assert.Null(o.AccessToken);
        Assert.Equal("/work/here/results", o.OutputRoot);
        Assert.Equal(StoreKind.Sqlite, o.Store.Kind);
        Assert.Equal("/work/here/.latsweep/store.db", o.Store.Value);
        Assert.True(o.IsLoopbackOnly);
    }

    [Fact]
    public void Every_option_is_read_with_a_space_or_an_equals_sign()
    {
        var o = Parse("--store=data/s.db", "--out", "/abs/out", "--port", "6001", "--bind=0.0.0.0", "--token", "0123456789abcdef");
        Assert.Equal("/work/here/data/s.db", o.Store.Value);
        Assert.Equal("/abs/out", o.OutputRoot);
        Assert.Equal(6001, o.Port);
        Assert.Equal(IPAddress.Any, o.BindAddress);
        Assert.Equal("0123456789abcdef", o.AccessToken);
        Assert.False(o.IsLoopbackOnly);
    }

    [Fact]
    public void A_postgres_store_is_accepted()
    {
        var o = Parse("--out", "o", "--store", "postgres://u:p@db.invalid:5433/sweeps");
        Assert.Equal(StoreKind.Postgres, o.Store.Kind);
    }

    [Fact]
    public void The_token_may_come_from_the_environment()
    {
        var o = DashboardArguments.Parse(["--out", "o"], Here, name => name == DashboardOptions.TokenEnvironmentVariable ? "from-the-environment" : null);
        Assert.Equal("from-the-environment", o.AccessToken);
    }

    [Theory]
    [InlineData("localhost", "127.0.0.1")]
    [InlineData("::1", "::1")]
    [InlineData("[::1]", "::1")]
    [InlineData("192.0.2.7", "192.0.2.7")]
    public void Bind_addresses_are_parsed(string text, string expected) =>
        Assert.Equal(IPAddress.Parse(expected), Parse("--out", "o", "--bind", text).BindAddress);

    [Theory]
    [InlineData(new[] { "--port", "80000", "--out", "o" }, "--port: '80000' is not a port number")]
    [InlineData(new[] { "--port", "http", "--out", "o" }, "--port: 'http'")]
    [InlineData(new[] { "--bind", "my-laptop", "--out", "o" }, "--bind: 'my-laptop' is not an IP address")]
    [InlineData(new[] { "--out" }, "--out needs a value")]
    [InlineData(new[] { "--out", "o", "--colour", "blue" }, "unknown option '--colour'")]
    [InlineData(new[] { "--out", "o", "--store", "postgres://" }, "--store:")]
    public void Bad_options_get_a_message_that_names_them(string[] args, string message)
    {
        var ex = Assert.Throws<DashboardStartException>(() => Parse(args));
        Assert.Contains(message, ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void The_output_root_defaults_to_the_one_latsweep_writes() =>
        Assert.Equal("/work/here/results", Parse().OutputRoot);

    [Fact]
    public void A_missing_output_root_refuses_to_start()
    {
        var o = Parse("--out", "/no/such/folder/for/latsweep");
        var ex = Assert.Throws<DashboardStartException>(() => DashboardHost.Build(o));
        Assert.Contains("/no/such/folder/for/latsweep does not exist", ex.Message, StringComparison.Ordinal);
    }
}
