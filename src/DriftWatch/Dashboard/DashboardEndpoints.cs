using System.Data.Common;
using System.Globalization;
using DriftWatch.Dashboard.Access;
using DriftWatch.Dashboard.Actions;
using DriftWatch.Dashboard.Api;
using DriftWatch.Dashboard.Data;
using DriftWatch.Dashboard.Health;
using DriftWatch.Dashboard.Metrics;
using DriftWatch.Dashboard.Pages;
using DriftWatch.Output;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Dashboard;

/// <summary>
/// The dashboard's endpoints: pages (/, /pairs/{name}, /alerts), JSON (/api/…), /healthz, /metrics, the sign-in
/// form, the pair page's triage actions (<see cref="ActionEndpoints"/>, POST, signed in, CSRF-checked) and the
/// embedded assets. Call after <see cref="DashboardServices.Add"/>. Everything else is read-only.
/// </summary>
internal static class DashboardEndpoints
{
    private const string HtmlType = "text/html; charset=utf-8";

    // Pages load only their own stylesheet and script; inline SVG needs no more. Nothing may frame them.
    private const string ContentSecurityPolicy =
        "default-src 'none'; style-src 'self'; script-src 'self'; img-src 'self' data:; form-action 'self'; frame-ancestors 'none'; base-uri 'none'";

    public static IEndpointRouteBuilder Map(IEndpointRouteBuilder app)
    {
        ArgumentNullException.ThrowIfNull(app);
        var services = app.ServiceProvider;
        var access = services.GetRequiredService<DashboardAccess>();
        var reader = services.GetRequiredService<DashboardReader>();
        var metrics = services.GetRequiredService<DashboardMetrics>();
        var health = services.GetRequiredService<HealthCheck>();
        var logger = services.GetRequiredService<ILoggerFactory>().CreateLogger("DriftWatch.Dashboard");

        // Every endpoint, assets and sign-in included, passes the Host check first when there is one.
        var site = app.MapGroup(string.Empty);
        if (access.Hosts is { } hosts)
        {
            site.AddEndpointFilter(new HostFilter(hosts));
        }

        // HEAD on everything readable (health probes, link checkers); runs after each endpoint's own conventions.
        ((IEndpointConventionBuilder)site).Finally(HeadForGet.Allow);

        site.MapGet(DashboardAssets.CssPath, (HttpContext http) => Asset(http, DashboardAssets.Css, "text/css; charset=utf-8"));
        site.MapGet(DashboardAssets.ScriptPath, (HttpContext http) => Asset(http, DashboardAssets.Script, "text/javascript; charset=utf-8"));
        LoginEndpoints.Map(site, access, reader.Time);

        var guarded = site.MapGroup(string.Empty).AddEndpointFilter(new AccessFilter(access));
        guarded.MapGet("/", (HttpContext http, CancellationToken ct) => Page(http, logger, reader.Time, async () =>
        {
            var rows = await reader.GetOverviewAsync(ct);
            var query = http.Request.Query;
            var filter = new OverviewFilter(Text(query["status"]), Text(query["source"]), Text(query["tag"]), Text(query["q"]));
            var workers = await health.WorkersAsync(ct);
            return (StatusCodes.Status200OK, OverviewPage.Render(Context(http, access, reader), rows, filter, workers));
        }));

        guarded.MapGet("/pairs/{name}", (HttpContext http, string name, CancellationToken ct) => Page(http, logger, reader.Time, async () =>
        {
            var pair = await reader.ResolvePairAsync(name, ct);
            if (pair is null)
            {
                return (StatusCodes.Status404NotFound, MessagePage.Render(Context(http, access, reader), "No such pair", $"No pair named '{name}' is configured or has history in the store{await reader.DidYouMeanAsync(name, ct)}."));
            }

            var detail = await reader.GetPairAsync(pair, PageNumber(http.Request.Query["page"]), DashboardReader.DefaultPageSize, ct);
            var triage = await ActionEndpoints.PanelAsync(http, access, services, pair, ct);
            return (StatusCodes.Status200OK, PairPage.Render(Context(http, access, reader), detail, triage));
        }));

        ActionEndpoints.Map(guarded, access);

        guarded.MapGet("/alerts", (HttpContext http, CancellationToken ct) => Page(http, logger, reader.Time, async () =>
            (StatusCodes.Status200OK, AlertsPage.Render(Context(http, access, reader), await reader.GetAlertsAsync(Text(http.Request.Query["pair"]), ct)))));

        guarded.MapGet("/api", (HttpContext http) =>
        {
            NoStore(http);
            return Results.Json(ApiIndex.Build(services.GetRequiredService<EndpointDataSource>()), JsonContract.CompactOptions);
        }).WithDescription("this index: every endpoint with its methods");

        guarded.MapGet("/api/pairs", (HttpContext http, CancellationToken ct) => Json(http, logger, async () =>
        {
            var rows = await reader.GetOverviewAsync(ct);
            return (StatusCodes.Status200OK, (object)new PairsResponse(reader.Time.GetUtcNow(), [.. rows.Select(ApiMapping.ToJson)]));
        })).WithDescription("every pair with its status, latest run and baseline");

        guarded.MapGet("/api/pairs/{name}/runs", (HttpContext http, string name, CancellationToken ct) => Json(http, logger, async () =>
        {
            var pair = await reader.ResolvePairAsync(name, ct);
            if (pair is null)
            {
                return (StatusCodes.Status404NotFound, (object)new ErrorJson($"no pair named '{name}'{await reader.DidYouMeanAsync(name, ct)}"));
            }

            var query = http.Request.Query;
            var size = int.TryParse(query["page_size"], NumberStyles.None, CultureInfo.InvariantCulture, out var s) ? s : DashboardReader.DefaultPageSize;
            var detail = await reader.GetPairAsync(pair, PageNumber(query["page"]), size, ct);
            return (StatusCodes.Status200OK, (object)new RunsResponse(pair, detail.Page, detail.PageSize, detail.PageCount, detail.TotalRuns, [.. detail.Runs.Select(RunJson.Of)]));
        })).WithDescription("a pair's runs, newest first (page, page_size)");

        guarded.MapGet("/api/alerts", (HttpContext http, CancellationToken ct) => Json(http, logger, async () =>
            (StatusCodes.Status200OK, (object)ApiMapping.ToJson(await reader.GetAlertsAsync(Text(http.Request.Query["pair"]), ct), reader.Time.GetUtcNow())))).WithDescription("open alerts, those cleared in the last 7 days and the outbox (pair)");

        guarded.MapGet("/healthz", async (HttpContext http, CancellationToken ct) =>
        {
            var report = await health.CheckAsync(ct);
            NoStore(http);
            return Results.Json(report, JsonContract.CompactOptions, statusCode: report.Healthy ? StatusCodes.Status200OK : StatusCodes.Status503ServiceUnavailable);
        }).WithDescription("the store and the scheduler: 200 healthy, 503 not");

        guarded.MapGet("/metrics", async (HttpContext http, CancellationToken ct) =>
        {
            NoStore(http);
            try
            {
                return Results.Text(await metrics.RenderAsync(ct), OpenMetricsText.ContentType);
            }
            catch (DbException ex)
            {
                logger.LogWarning(ex, "Metrics could not be read from the store");
                if (metrics.HasWorker)
                {
                    // The worker's own figures (the spool filling up above all) matter most while the store is down.
                    return Results.Text(metrics.RenderWorkerOnly(), OpenMetricsText.ContentType);
                }

                return Results.Text("the store cannot be read: " + ex.Message + "\n", "text/plain; charset=utf-8", statusCode: StatusCodes.Status503ServiceUnavailable);
            }
        }).WithDescription("OpenMetrics text: runs, open alerts, check durations");

        LogStart(services, access, logger);
        return app;
    }

    private static PageContext Context(HttpContext http, DashboardAccess access, DashboardReader reader) =>
        new(ServedLinks.Instance, InlineAssets: false, reader.Time.GetUtcNow(),
            ShowSignOut: access.SessionOf(http.Request) is not null);

    private static async Task<IResult> Page(HttpContext http, ILogger logger, TimeProvider time, Func<Task<(int Status, string Html)>> render)
    {
        PageHeaders(http);
        try
        {
            var (status, html) = await render();
            return Results.Content(html, HtmlType, statusCode: status);
        }
        catch (DbException ex)
        {
            logger.LogWarning(ex, "Dashboard page {Path} could not read the store", http.Request.Path.Value);
            var page = MessagePage.Render(new PageContext(ServedLinks.Instance, false, time.GetUtcNow()), "Store unavailable", "The history store cannot be read right now: " + ex.Message);
            return Results.Content(page, HtmlType, statusCode: StatusCodes.Status503ServiceUnavailable);
        }
    }

    private static async Task<IResult> Json(HttpContext http, ILogger logger, Func<Task<(int Status, object Body)>> produce)
    {
        NoStore(http);
        try
        {
            var (status, body) = await produce();
            return Results.Json(body, JsonContract.CompactOptions, statusCode: status);
        }
        catch (DbException ex)
        {
            logger.LogWarning(ex, "Dashboard API {Path} could not read the store", http.Request.Path.Value);
            return Results.Json(new ErrorJson("the store cannot be read: " + ex.Message), JsonContract.CompactOptions, statusCode: StatusCodes.Status503ServiceUnavailable);
        }
    }

    private static IResult Asset(HttpContext http, string text, string contentType)
    {
        var etag = "\"" + DashboardAssets.Version + "\"";
        http.Response.Headers.ETag = etag;
        http.Response.Headers.CacheControl = "no-cache";
        http.Response.Headers.XContentTypeOptions = "nosniff";
        return http.Request.Headers.IfNoneMatch.ToString() == etag ? Results.StatusCode(StatusCodes.Status304NotModified) : Results.Text(text, contentType);
    }

    internal static void PageHeaders(HttpContext http)
    {
        var headers = http.Response.Headers;
        headers.ContentSecurityPolicy = ContentSecurityPolicy;
        headers.XContentTypeOptions = "nosniff";
        headers.XFrameOptions = "DENY";
        headers["Referrer-Policy"] = "no-referrer";
        headers.CacheControl = "no-store";
    }

    private static void NoStore(HttpContext http)
    {
        http.Response.Headers.CacheControl = "no-store";
        http.Response.Headers.XContentTypeOptions = "nosniff";
    }

    private static string? Text(Microsoft.Extensions.Primitives.StringValues value) => string.IsNullOrEmpty(value.ToString()) ? null : value.ToString();

    private static int PageNumber(Microsoft.Extensions.Primitives.StringValues value) =>
        int.TryParse(value.ToString(), NumberStyles.None, CultureInfo.InvariantCulture, out var page) && page > 0 ? page : 1;

    /// <summary>Says where the dashboard listens and whether it asks for a token, once the server has bound its addresses.</summary>
    private static void LogStart(IServiceProvider services, DashboardAccess access, ILogger logger)
    {
        var lifetime = services.GetService<IHostApplicationLifetime>();
        var server = services.GetService<IServer>();
        lifetime?.ApplicationStarted.Register(() =>
        {
            var addresses = server?.Features.Get<IServerAddressesFeature>()?.Addresses.ToArray() ?? [];
            var mode = access.TokenRequired
                ? "access token required (Authorization: Bearer or the sign-in form)"
                : "loopback only, no access token";
            logger.LogInformation("Dashboard listening on {Addresses}: {AccessMode}", string.Join(", ", addresses), mode);
        });
    }
}
