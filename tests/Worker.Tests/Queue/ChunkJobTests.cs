using Hangfire.Common;
using Hangfire.Storage;
using LatticeSweep.Worker.Queue;

namespace LatticeSweep.Worker.Tests.Queue;

public sealed class ChunkJobTests
{
    [Fact]
    public void A_chunk_job_is_stored_as_the_expression_form_would_store_it()
    {
        var made = ChunkJob.For("sweep-a", "c0007");
        var expressed = Job.FromExpression<ChunkJob>(j => j.RunAsync("sweep-a", "c0007", null, CancellationToken.None));

        Assert.Equal(expressed.Type, made.Type);
        Assert.Equal(expressed.Method, made.Method);
        Assert.Equal(expressed.Args, made.Args);
        Assert.Equal(expressed.Queue, made.Queue);

        // What the store keeps (and a worker reads back) is the same text.
        var stored = InvocationData.SerializeJob(made);
        var storedExpressed = InvocationData.SerializeJob(expressed);
        Assert.Equal(storedExpressed.Type, stored.Type);
        Assert.Equal(storedExpressed.Method, stored.Method);
        Assert.Equal(storedExpressed.ParameterTypes, stored.ParameterTypes);
        Assert.Equal(storedExpressed.Arguments, stored.Arguments);
        Assert.Equal(storedExpressed.Queue, stored.Queue);
        Assert.Contains("c0007", stored.Arguments, StringComparison.Ordinal);

        var read = stored.DeserializeJob();
        Assert.Equal(["sweep-a", "c0007"], read.Args.Take(2));
    }
}
