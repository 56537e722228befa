using System.Collections.Immutable;

namespace LatticeSweep.Worker.Catalog;

/// <summary>Failed points of a sweep that share one reason, with a few of their ids.</summary>
public sealed record FailureGroup(FailureKind Kind, string Reason, long Count, ImmutableArray<string> ExamplePointIds);
