namespace LatticeSweep.Worker;

/// <summary>The <c>latsweep</c> command line.</summary>
internal static class Program
{
    private static int Main(string[] args)
    {
        Console.Error.WriteLine("latsweep: commands are being built");
        return args.Length == 0 ? 2 : 2;
    }
}
