namespace LatticeSweep.Engine.Samples;

/// <summary>What part of reciprocal space a calculation covers: a finite crystal or the bulk limit.</summary>
public abstract record Sample;
