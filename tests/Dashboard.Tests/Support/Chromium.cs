using Microsoft.Playwright;

namespace LatticeSweep.Dashboard.Tests.Support;

/// <summary>
/// Headless Chromium from the system's packages (Debian's <c>chromium</c>), driven by Playwright's
/// bundled driver. Playwright never downloads a browser here: the executable is given. Each
/// session gets a new, empty profile folder.
/// </summary>
internal sealed class Chromium : IAsyncDisposable
{
    /// <summary>Environment variable that gives the browser path (scripts/test.sh sets it).</summary>
    public const string PathVariable = "LATSWEEP_TEST_CHROMIUM";

    public const string DefaultPath = "/usr/bin/chromium";

    private static readonly string[] Arguments =
    [
        "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
        "--disable-background-networking", "--disable-component-update", "--disable-sync",
    ];

    private readonly IPlaywright _playwright;
    private readonly TempFolder _profile;

    private Chromium(IPlaywright playwright, IBrowserContext context, TempFolder profile)
    {
        _playwright = playwright;
        Context = context;
        _profile = profile;
    }

    public IBrowserContext Context { get; }

    public static async Task<Chromium> LaunchAsync()
    {
        var executable = Environment.GetEnvironmentVariable(PathVariable) is { Length: > 0 } p ? p : DefaultPath;
        if (!File.Exists(executable))
        {
            throw new InvalidOperationException($"Chromium is not at {executable}: install Debian's package (apt-get install -y chromium) or set {PathVariable}");
        }

        var profile = new TempFolder("latsweep-chromium-");
        var playwright = await Playwright.CreateAsync();
        try
        {
            var context = await playwright.Chromium.LaunchPersistentContextAsync(profile.Path, new BrowserTypeLaunchPersistentContextOptions
            {
                ExecutablePath = executable,
                Headless = true,
                Args = Arguments,
                ViewportSize = new ViewportSize { Width = 1400, Height = 900 },
                DeviceScaleFactor = 1,
                Timeout = 60_000,
            });
            return new Chromium(playwright, context, profile);
        }
        catch
        {
            playwright.Dispose();
            profile.Dispose();
            throw;
        }
    }

    public async ValueTask DisposeAsync()
    {
        await Context.CloseAsync();
        _playwright.Dispose();
        _profile.Dispose();
    }
}
