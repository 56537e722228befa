namespace LatticeSweep.Engine.Transport;

/// <summary>One relaxation time for every mode (ps), for comparisons with a textbook or another estimate.</summary>
public sealed record ConstantScattering(double RelaxationTimePs);
