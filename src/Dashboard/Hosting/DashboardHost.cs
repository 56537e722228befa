using System.Text.Json;
using Hangfire;
using LatticeSweep.Dashboard.Endpoints;
using LatticeSweep.Dashboard.Datasets;
using LatticeSweep.Dashboard.Security;
using LatticeSweep.Worker.Queue;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.AspNetCore.HostFiltering;
using Microsoft.AspNetCore.Http.Json;

namespace LatticeSweep.Dashboard.Hosting;

/// <summary>
/// The dashboard's entry point, shared by <c>dotnet run --project src/Dashboard</c> and
/// <c>latsweep dashboard</c>: builds the web application for a store and an output root.
/// </summary>
public static class DashboardHost
{
    /// <summary>
    /// Checks the options (a non-loopback address needs a token), opens the store and builds the
    /// site. Throws <see cref="DashboardStartException"/> with what to change when it cannot start.
    /// The caller starts it (<c>RunAsync</c>/<c>StartAsync</c>) and disposes it.
    /// </summary>
    public static WebApplication Build(DashboardOptions options)
    {
        ArgumentNullException.ThrowIfNull(options);
        StartPolicy.Check(options);
        QueueStore store;
        try
        {
            store = QueueStore.OpenExisting(options.Store, options.Time); // the dashboard never creates a store
        }
        catch (StoreUnavailableException ex)
        {
            throw new DashboardStartException($"--store: {ex.Message}", ex);
        }

        try
        {
            return BuildSite(options, store);
        }
        catch
        {
            store.Dispose();
            throw;
        }
    }

    /// <summary>Builds, starts and serves until <paramref name="ct"/> fires; prints where to open it.</summary>
    public static async Task RunAsync(DashboardOptions options, TextWriter output, CancellationToken ct)
    {
        ArgumentNullException.ThrowIfNull(output);
        await using var app = Build(options);
        await app.StartAsync(ct).ConfigureAwait(false);
        var address = Addresses(app).FirstOrDefault() ?? $"http://{options.BindAddress}:{options.Port}";
        await output.WriteLineAsync($"LatticeSweep dashboard: {address}/").ConfigureAwait(false);
        if (options.AccessToken is not null)
        {
            await output.WriteLineAsync($"  open once with the token: {address}/?{AccessTokenMiddleware.QueryName}=<your token>").ConfigureAwait(false);
        }

        await output.WriteLineAsync($"  store {options.Store.Display}; results under {options.OutputRoot}; queue internals at {address}{DashboardOptions.QueuePath}").ConfigureAwait(false);
        await output.WriteLineAsync("  Ctrl+C stops it.").ConfigureAwait(false);
        try
        {
            await Task.Delay(Timeout.Infinite, ct).ConfigureAwait(false);
        }
        catch (OperationCanceledException) when (ct.IsCancellationRequested)
        {
        }

        await app.StopAsync(CancellationToken.None).ConfigureAwait(false);
    }

    /// <summary>The addresses the started site listens on, e.g. <c>http://127.0.0.1:5080</c> (the real port when 0 was asked).</summary>
    public static IReadOnlyList<string> Addresses(WebApplication app)
    {
        ArgumentNullException.ThrowIfNull(app);
        return [.. app.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()?.Addresses ?? []];
    }

    private static WebApplication BuildSite(DashboardOptions options, QueueStore store)
    {
        var builder = WebApplication.CreateBuilder(new WebApplicationOptions
        {
            // The pages and files live with this assembly, whichever program hosts it.
            ApplicationName = typeof(DashboardHost).Assembly.GetName().Name,
            ContentRootPath = AppContext.BaseDirectory,
            WebRootPath = Path.Combine(AppContext.BaseDirectory, "wwwroot"),
            EnvironmentName = Environments.Production,
        });
        builder.WebHost.ConfigureKestrel(k => k.Listen(options.BindAddress, options.Port));
        builder.Logging.SetMinimumLevel(LogLevel.Warning);

        var results = new ResultStore(new OutputRoot(options.OutputRoot));
        builder.Services.AddSingleton(_ => store);
        builder.Services.AddSingleton(options);
        builder.Services.AddSingleton(new SweepBoard(store, results, options.Time));
        builder.Services.AddRazorPages().AddApplicationPart(typeof(DashboardHost).Assembly);
        builder.Services.AddAntiforgery(o =>
        {
            o.Cookie.Name = "latsweep_form";
            o.Cookie.SameSite = SameSiteMode.Strict;
            o.Cookie.HttpOnly = true;
        });
        builder.Services.Configure<JsonOptions>(o =>
        {
            o.SerializerOptions.PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower;
            o.SerializerOptions.NumberHandling = System.Text.Json.Serialization.JsonNumberHandling.AllowNamedFloatingPointLiterals;
        });

        // Hangfire's pages for this store. AddHangfire is not used: it would point Hangfire's global
        // logging at this site's logger factory, which dies with the site while the process goes on.
        builder.Services.AddSingleton<JobStorage>(store.Storage);
        builder.Services.AddSingleton<IGlobalConfiguration>(GlobalConfiguration.Configuration);
        builder.Services.AddSingleton(Hangfire.Dashboard.DashboardRoutes.Routes);

        if (options.AccessToken is null)
        {
            // Loopback without a token: accept only loopback host names, so a web page elsewhere
            // cannot reach the dashboard through a DNS name rebound to 127.0.0.1.
            builder.Services.Configure<HostFilteringOptions>(o => o.AllowedHosts = ["localhost", "127.0.0.1", "[::1]"]);
        }
        else
        {
            builder.Services.Configure<HostFilteringOptions>(o => o.AllowedHosts = ["*"]);
        }

        var app = builder.Build();
        app.Use(Diagnostics.RequestTimings.Measure);
        app.UseHostFiltering();
        app.UseExceptionHandler("/error");
        app.UseStatusCodePagesWithReExecute("/not-found");
        app.Use(SecurityHeaders);
        if (options.AccessToken is { } token)
        {
            app.UseMiddleware<AccessTokenMiddleware>(new AccessToken(token));
        }

        app.UseHangfireDashboard(DashboardOptions.QueuePath, new Hangfire.DashboardOptions
        {
            AppPath = "/",
            DashboardTitle = "LatticeSweep queue",
            DisplayStorageConnectionString = false,
            IsReadOnlyFunc = _ => true,
            Authorization = [new QueueDashboardAuthorization()],
        }, store.Storage);
        app.UseStaticFiles();
        app.UseRouting();
        app.MapRazorPages();
        app.MapDashboardApi();
        return app;
    }

    private static Task SecurityHeaders(HttpContext context, Func<Task> next)
    {
        var headers = context.Response.Headers;
        headers.XContentTypeOptions = "nosniff";
        headers.XFrameOptions = "DENY";
        headers["Referrer-Policy"] = "no-referrer";
        if (!context.Request.Path.StartsWithSegments(DashboardOptions.QueuePath, StringComparison.Ordinal))
        {
            // Our pages load scripts and styles from this site only (Hangfire's pages bring their own inline parts).
            headers.ContentSecurityPolicy = "default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self' data:; object-src 'none'; base-uri 'none'; form-action 'self'; frame-ancestors 'none'";
        }

        return next();
    }
}
