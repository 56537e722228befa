namespace LatticeSweep.Engine.Elastic;

/// <summary>The three independent elastic constants of a cubic crystal, GPa.</summary>
public sealed record CubicElasticConstants(double C11Gpa, double C12Gpa, double C44Gpa);
