namespace LatticeSweep.Engine.Tests.Determinism;

/// <summary>The test assembly's entry point: nothing for the test host; the probe when asked (<see cref="SameBitsProbe"/>).</summary>
internal static class ProbeProgram
{
    public static int Main(string[] args)
    {
        if (args is [SameBitsProbe.Argument])
        {
            SameBitsProbe.Write(Console.Out);
        }

        return 0;
    }
}
