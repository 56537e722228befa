namespace LatticeSweep.Engine.Transport;

/// <summary>One stable isotope: mass number, atomic mass (amu) and its amount fraction in natural material.</summary>
public sealed record Isotope(int MassNumber, double MassAmu, double Abundance);
