namespace LatticeSweep.Engine.Transport;

/// <summary>The relaxation-time channels that Matthiessen's rule adds up.</summary>
public enum ScatteringChannel
{
    Boundary = 0,
    PointDefect = 1,
    Umklapp = 2,
    Constant = 3,
}
