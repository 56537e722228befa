namespace LatticeSweep.Worker.Tests.EndToEnd;

/// <summary>
/// The end-to-end tests on real stores run one at a time and after the other tests: they start
/// worker processes that need both cores, and one of them stops and restarts the shared test
/// PostgreSQL server, which no other test may be using at that moment.
/// </summary>
[CollectionDefinition(Name, DisableParallelization = true)]
public sealed class RealStoresCollection
{
    public const string Name = "Sweeps on real stores";
}
