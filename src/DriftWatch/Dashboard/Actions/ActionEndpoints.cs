using System.Globalization;
using DriftWatch.Configuration;
using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard.Access;
using DriftWatch.Dashboard.Data;
using DriftWatch.Dashboard.Pages;
using DriftWatch.Monitoring;
using DriftWatch.Store;
using DriftWatch.Triage;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;
using Microsoft.Extensions.DependencyInjection;

namespace DriftWatch.Dashboard.Actions;

/// <summary>
/// POST /pairs/{name}/ack|snooze|unsnooze|baseline/accept|baseline/reset: the pair page's forms. Each passes
/// <see cref="ActionRequest"/>'s checks, calls the same <see cref="TriageActions"/> the CLI calls, and answers
/// 303 back to the pair page (post/redirect/get), or a page saying why nothing changed.
/// </summary>
internal static class ActionEndpoints
{
    public static void Map(IEndpointRouteBuilder app, DashboardAccess access)
    {
        ArgumentNullException.ThrowIfNull(app);
        var services = app.ServiceProvider;
        var config = services.GetRequiredService<DriftWatchConfig>();
        var actions = services.GetRequiredService<TriageActions>();
        var time = services.GetRequiredService<TimeProvider>();

        app.MapPost("/pairs/{name}/ack", (HttpContext http, string name, CancellationToken ct) => Act(http, access, config, time, name, async (request, pair) =>
        {
            if (!long.TryParse(request.Form["alert_id"], NumberStyles.None, CultureInfo.InvariantCulture, out var id))
            {
                return Problem(http, time, StatusCodes.Status400BadRequest, "No alert chosen", "The form did not name an alert.", pair.Name);
            }

            var alert = await actions.AckAsync(id, request.Actor, request.Reason, ct);
            return alert is null || alert.Pair != pair.Name
                ? Problem(http, time, StatusCodes.Status404NotFound, "No such open alert", $"Alert #{id} is not open (it may have cleared meanwhile).", pair.Name)
                : null;
        }));

        app.MapPost("/pairs/{name}/snooze", (HttpContext http, string name, CancellationToken ct) => Act(http, access, config, time, name, async (request, pair) =>
        {
            var text = request.Form["for"].ToString();
            if (!DurationSyntax.TryParse(text, out var span, out var problem) || span < TimeSpan.FromMinutes(1) || span > TriageActions.MaxSnooze)
            {
                return Problem(http, time, StatusCodes.Status400BadRequest, "Snooze not set", $"'For' {problem ?? "must be between 1 minute and 31 days"} (was '{text}').", pair.Name);
            }

            if (request.Reason is null)
            {
                return Problem(http, time, StatusCodes.Status400BadRequest, "Snooze not set", "Say why the pair is snoozed.", pair.Name);
            }

            await actions.SnoozeAsync(pair.Name, span, request.Actor, request.Reason, ct);
            return null;
        }));

        app.MapPost("/pairs/{name}/unsnooze", (HttpContext http, string name, CancellationToken ct) => Act(http, access, config, time, name, async (request, pair) =>
            await actions.UnsnoozeAsync(pair.Name, request.Actor, request.Reason, ct)
                ? null
                : Problem(http, time, StatusCodes.Status409Conflict, "Not snoozed", $"'{pair.Name}' was not snoozed.", pair.Name)));

        app.MapPost("/pairs/{name}/baseline/accept", (HttpContext http, string name, CancellationToken ct) => Act(http, access, config, time, name, async (request, pair) =>
        {
            if (!long.TryParse(request.Form["run_id"], NumberStyles.None, CultureInfo.InvariantCulture, out var runId))
            {
                return Problem(http, time, StatusCodes.Status400BadRequest, "No run chosen", "The form did not name a run.", pair.Name);
            }

            if (request.Reason is null)
            {
                return Problem(http, time, StatusCodes.Status400BadRequest, "Baseline not changed", "Say why this run becomes the baseline.", pair.Name);
            }

            var force = request.Form["force"].ToString() == "true";
            var outcome = await actions.AcceptBaselineAsync(pair, runId, force, request.Actor, request.Reason, ct);
            return outcome.Result switch
            {
                AcceptResult.Accepted => null,
                AcceptResult.Refused => Problem(http, time, StatusCodes.Status409Conflict, "Baseline not changed",
                    outcome.Message.Replace("with --force (the dashboard asks you to confirm)", "by ticking \"even though it has warning or critical findings\"", StringComparison.Ordinal), pair.Name),
                AcceptResult.RunNotFound => Problem(http, time, StatusCodes.Status404NotFound, "Baseline not changed", outcome.Message, pair.Name),
                _ => Problem(http, time, StatusCodes.Status409Conflict, "Baseline not changed", outcome.Message, pair.Name),
            };
        }));

        app.MapPost("/pairs/{name}/baseline/reset", (HttpContext http, string name, CancellationToken ct) => Act(http, access, config, time, name, async (request, pair) =>
        {
            if (request.Reason is null)
            {
                return Problem(http, time, StatusCodes.Status400BadRequest, "Baseline not reset", "Say why the baseline is reset.", pair.Name);
            }

            await actions.ResetBaselineAsync(pair, request.Actor, request.Reason, ct);
            return null;
        }));
    }

    /// <summary>Loads what the pair page's triage section shows for this request.</summary>
    public static async Task<TriagePanel> PanelAsync(HttpContext http, DashboardAccess access, IServiceProvider services, string pair, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(http);
        ArgumentNullException.ThrowIfNull(access);
        ArgumentNullException.ThrowIfNull(services);
        var now = services.GetRequiredService<TimeProvider>().GetUtcNow();
        var audit = await services.GetRequiredService<IAuditStore>().ListAsync(pair, TriagePanel.AuditRows, cancellationToken);
        var snoozes = await services.GetRequiredService<IAlertStore>().ListSnoozesAsync(now, cancellationToken);
        var reset = await services.GetRequiredService<BaselineService>().GetResetAsync(pair, cancellationToken);
        var session = access.SessionOf(http.Request);
        var proxied = access.UserHeader is not null && Actor.Clean(http.Request.Headers[access.UserHeader].ToString()) is not null;
        return new TriagePanel(
            audit,
            snoozes.FirstOrDefault(s => s.Pair == pair),
            reset,
            session?.CsrfToken,
            access.ActorName(http.Request, session),
            proxied,
            services.GetRequiredService<DriftWatchConfig>().FindPair(pair) is not null);
    }

    private static async Task<IResult> Act(
        HttpContext http, DashboardAccess access, DriftWatchConfig config, TimeProvider time, string name, Func<ActionRequest, PairConfig, Task<IResult?>> act)
    {
        var (request, refusal) = await ActionRequest.ReadAsync(http, access);
        if (refusal is not null)
        {
            return refusal;
        }

        var pair = config.FindPair(name);
        if (pair is null)
        {
            return Problem(http, time, StatusCodes.Status404NotFound, "No such pair", $"No pair named '{name}' is configured.", null);
        }

        var failed = await act(request!, pair);
        return failed ?? SeeOther(http, "/pairs/" + Uri.EscapeDataString(pair.Name) + "#" + TriageSection.AnchorId);
    }

    /// <summary>303: the browser follows with a GET, so a reload does not send the form again.</summary>
    private static IResult SeeOther(HttpContext http, string location)
    {
        http.Response.Headers.Location = location;
        return Results.StatusCode(StatusCodes.Status303SeeOther);
    }

    private static IResult Problem(HttpContext http, TimeProvider time, int status, string title, string message, string? pair)
    {
        DashboardEndpoints.PageHeaders(http);
        var context = new PageContext(ServedLinks.Instance, InlineAssets: false, time.GetUtcNow());
        var back = pair is null ? string.Empty : $" Back to the pair: /pairs/{Uri.EscapeDataString(pair)}";
        return Results.Content(MessagePage.Render(context, title, message + " Nothing was changed." + back), "text/html; charset=utf-8", statusCode: status);
    }
}
