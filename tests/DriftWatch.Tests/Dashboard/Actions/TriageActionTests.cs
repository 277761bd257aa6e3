using System.Net;
using System.Text.RegularExpressions;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Triage;
using DriftWatch.Dashboard.Access;
using DriftWatch.Store;
using DriftWatch.Triage;
using Microsoft.Extensions.DependencyInjection;

namespace DriftWatch.Tests.Dashboard.Actions;

/// <summary>
/// The pair page's action forms over a real Kestrel dashboard and the scenario's SQLite store: who may POST
/// (a signed-in session, its CSRF token, a name), what is refused (403, nothing changed), and that an accepted
/// action lands in the store and its audit log.
/// </summary>
public sealed partial class TriageActionTests
{
    private const string Token = "k7Qm2v9XwL4pR8sT1nZc";

    private static readonly DashboardConfig Exposed = new() { Bind = "0.0.0.0", Port = 8087, AccessToken = Token };

    private static string PairPath => "/pairs/" + Uri.EscapeDataString(DashboardScenario.Perfect);

    [Fact]
    public async Task Ack_WithoutSignIn_WhenATokenIsConfigured_IsRefused_AndNothingChanges()
    {
        await using var scenario = await DashboardScenario.CreateAsync();
        await using var host = await DashboardHost.StartAsync(scenario, Exposed);
        var alert = await OpenAlertAsync(scenario);

        using var bare = await PostAsync(host, PairPath + "/ack", null, [new("alert_id", Id(alert))]);
        // The access filter sends a browser without a session to the sign-in form; the action never runs.
        Assert.Equal(HttpStatusCode.Redirect, bare.StatusCode);
        Assert.StartsWith("/login?next=", bare.Headers.Location!.OriginalString, StringComparison.Ordinal);

        // The Bearer token opens the API, not the forms: they need a session's CSRF token.
        using var bearer = new HttpRequestMessage(HttpMethod.Post, PairPath + "/ack") { Content = new FormUrlEncodedContent([new("alert_id", Id(alert))]) };
        bearer.Headers.Authorization = new System.Net.Http.Headers.AuthenticationHeaderValue("Bearer", Token);
        using var withBearer = await host.Client.SendAsync(bearer);
        Assert.Equal(HttpStatusCode.Forbidden, withBearer.StatusCode);

        Assert.Null((await scenario.Alerts.GetAlertAsync(alert, CancellationToken.None))!.AckedAt);
        Assert.Empty(await Audit(host).ListAsync(null, 10, CancellationToken.None));
    }

    [Fact]
    public async Task Ack_WithoutOrWithAWrongCsrfToken_Is403_WithTheSessionsToken_AcksAndRecordsTheName()
    {
        await using var scenario = await DashboardScenario.CreateAsync();
        await using var host = await DashboardHost.StartAsync(scenario, Exposed);
        var alert = await OpenAlertAsync(scenario);
        var cookie = await SignInAsync(host, [new("token", Token), new("name", "Dana Whitfield"), new("next", PairPath)]);
        var csrf = await CsrfAsync(host, cookie);

        using var missing = await PostAsync(host, PairPath + "/ack", cookie, [new("alert_id", Id(alert))]);
        Assert.Equal(HttpStatusCode.Forbidden, missing.StatusCode);
        using var wrong = await PostAsync(host, PairPath + "/ack", cookie, [new("alert_id", Id(alert)), new("csrf", new string('a', 64))]);
        Assert.Equal(HttpStatusCode.Forbidden, wrong.StatusCode);
        // Another session's token does not fit this one.
        var other = await SignInAsync(host, [new("token", Token), new("name", "Someone Else"), new("next", PairPath)]);
        using var foreign = await PostAsync(host, PairPath + "/ack", cookie, [new("alert_id", Id(alert)), new("csrf", await CsrfAsync(host, other))]);
        Assert.Equal(HttpStatusCode.Forbidden, foreign.StatusCode);
        Assert.Null((await scenario.Alerts.GetAlertAsync(alert, CancellationToken.None))!.AckedAt);
        Assert.Empty(await Audit(host).ListAsync(null, 10, CancellationToken.None));

        using var right = await PostAsync(host, PairPath + "/ack", cookie, [new("alert_id", Id(alert)), new("csrf", csrf), new("reason", "known: invoices now derived by the billing job")]);
        Assert.Equal(HttpStatusCode.SeeOther, right.StatusCode);
        Assert.Equal(PairPath + "#triage", right.Headers.Location!.OriginalString);

        Assert.Equal(DashboardScenario.Now, (await scenario.Alerts.GetAlertAsync(alert, CancellationToken.None))!.AckedAt);
        var entry = Assert.Single(await Audit(host).ListAsync(DashboardScenario.Perfect, 10, CancellationToken.None));
        Assert.Equal(("Dana Whitfield", Actor.ViaDashboard, AuditAction.Ack, alert), (entry.Actor, entry.Via, entry.Action, entry.AlertId!.Value));
        Assert.Equal("known: invoices now derived by the billing job", entry.Reason);
        Assert.Equal(DashboardScenario.Now, entry.At);

        var (_, page) = await GetAsync(host, PairPath, cookie);
        Assert.Contains("Dana Whitfield", AuditTable().Match(page).Value, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Actions_FromAnotherOrigin_Are403_EvenWithTheRightToken()
    {
        await using var scenario = await DashboardScenario.CreateAsync();
        await using var host = await DashboardHost.StartAsync(scenario, Exposed);
        var cookie = await SignInAsync(host, [new("token", Token), new("name", "Dana"), new("next", PairPath)]);
        var csrf = await CsrfAsync(host, cookie);

        using var request = new HttpRequestMessage(HttpMethod.Post, PairPath + "/snooze")
        {
            Content = new FormUrlEncodedContent([new("csrf", csrf), new("for", "2h"), new("reason", "maintenance")]),
        };
        request.Headers.Add("Cookie", cookie);
        request.Headers.Add("Origin", "http://evil.example");
        using var response = await host.Client.SendAsync(request);

        Assert.Equal(HttpStatusCode.Forbidden, response.StatusCode);
        Assert.Empty(await scenario.Alerts.ListSnoozesAsync(DashboardScenario.Now, CancellationToken.None));
    }

    [Fact]
    public async Task LoopbackWithoutToken_AsksForAName_ThenSnoozesAndUnsnoozes_UnderThatName()
    {
        await using var scenario = await DashboardScenario.CreateAsync();
        await using var host = await DashboardHost.StartAsync(scenario);

        // Reading needs no sign-in here; acting does (the CSRF token lives in the session).
        using var anonymous = await PostAsync(host, PairPath + "/snooze", null, [new("for", "2h"), new("reason", "x")]);
        Assert.Equal(HttpStatusCode.Forbidden, anonymous.StatusCode);
        var (_, page) = await GetAsync(host, PairPath, null);
        Assert.Contains("sign in", page, StringComparison.Ordinal);

        using var nameless = await host.Client.PostAsync(new Uri("/login", UriKind.Relative), new FormUrlEncodedContent([new("next", PairPath)]));
        Assert.Equal(HttpStatusCode.BadRequest, nameless.StatusCode);

        var cookie = await SignInAsync(host, [new("name", "Ola Berg"), new("next", PairPath)]);
        var csrf = await CsrfAsync(host, cookie);
        using var snooze = await PostAsync(host, PairPath + "/snooze", cookie, [new("csrf", csrf), new("for", "8h"), new("reason", "warehouse migration tonight")]);
        Assert.Equal(HttpStatusCode.SeeOther, snooze.StatusCode);
        var held = Assert.Single(await scenario.Alerts.ListSnoozesAsync(DashboardScenario.Now, CancellationToken.None));
        Assert.Equal((DashboardScenario.Perfect, DashboardScenario.Now.AddHours(8), "warehouse migration tonight"), (held.Pair, held.Until, held.Reason));

        using var unsnooze = await PostAsync(host, PairPath + "/unsnooze", cookie, [new("csrf", csrf)]);
        Assert.Equal(HttpStatusCode.SeeOther, unsnooze.StatusCode);
        Assert.Empty(await scenario.Alerts.ListSnoozesAsync(DashboardScenario.Now, CancellationToken.None));

        var log = await Audit(host).ListAsync(DashboardScenario.Perfect, 10, CancellationToken.None);
        Assert.Equal([AuditAction.Unsnooze, AuditAction.Snooze], log.Select(e => e.Action));
        Assert.All(log, e => Assert.Equal("Ola Berg", e.Actor));
        Assert.Equal("until 2026-12-01 02:20 UTC", log[1].Detail);
    }

    [Fact]
    public async Task UserHeader_WhenConfigured_NamesTheActor_AndIsIgnoredWhenNot()
    {
        await using var scenario = await DashboardScenario.CreateAsync();
        await using var host = await DashboardHost.StartAsync(scenario, Exposed with { UserHeader = "X-Forwarded-User" });
        var alert = await OpenAlertAsync(scenario);
        var cookie = await SignInAsync(host, [new("token", Token), new("name", "typed name"), new("next", PairPath)]);
        var csrf = await CsrfAsync(host, cookie);

        using var request = new HttpRequestMessage(HttpMethod.Post, PairPath + "/ack") { Content = new FormUrlEncodedContent([new("csrf", csrf), new("alert_id", Id(alert))]) };
        request.Headers.Add("Cookie", cookie);
        request.Headers.Add("X-Forwarded-User", "k.nakamura");
        using var response = await host.Client.SendAsync(request);

        Assert.Equal(HttpStatusCode.SeeOther, response.StatusCode);
        Assert.Equal("k.nakamura", Assert.Single(await Audit(host).ListAsync(null, 10, CancellationToken.None)).Actor);

        await using var plain = await DashboardHost.StartAsync(scenario, Exposed);
        var cookie2 = await SignInAsync(plain, [new("token", Token), new("name", "typed name"), new("next", PairPath)]);
        using var request2 = new HttpRequestMessage(HttpMethod.Post, PairPath + "/unsnooze") { Content = new FormUrlEncodedContent([new("csrf", await CsrfAsync(plain, cookie2))]) };
        request2.Headers.Add("Cookie", cookie2);
        request2.Headers.Add("X-Forwarded-User", "k.nakamura");
        await scenario.Alerts.SnoozeAsync(DashboardScenario.Perfect, DashboardScenario.Now.AddHours(1), DashboardScenario.Now, null, CancellationToken.None);
        using var response2 = await plain.Client.SendAsync(request2);
        Assert.Equal(HttpStatusCode.SeeOther, response2.StatusCode);
        Assert.Equal("typed name", (await Audit(plain).ListAsync(null, 10, CancellationToken.None))[0].Actor);
    }

    [Fact]
    public async Task AcceptRun_WithWarningFindings_IsRefusedUntilConfirmed_ThenAdoptsThatRun()
    {
        await using var scenario = await DashboardScenario.CreateAsync();
        await using var host = await DashboardHost.StartAsync(scenario, Exposed);
        var cookie = await SignInAsync(host, [new("token", Token), new("name", "Dana"), new("next", PairPath)]);
        var csrf = await CsrfAsync(host, cookie);
        var latest = (await scenario.History.GetRunsAsync(DashboardScenario.Perfect, 1, includePoints: false, CancellationToken.None))[0];
        Assert.True(latest.WorstSeverity >= Core.Findings.Severity.Warning, "the scenario's latest run of the perfect pair carries its critical finding");

        using var refused = await PostAsync(host, PairPath + "/baseline/accept", cookie, [new("csrf", csrf), new("run_id", Id(latest.Id)), new("reason", "gross is derived now")]);
        Assert.Equal(HttpStatusCode.Conflict, refused.StatusCode);
        Assert.Contains("even though it has warning or critical findings", await refused.Content.ReadAsStringAsync(), StringComparison.Ordinal);
        Assert.False((await scenario.History.GetBaselineAsync(DashboardScenario.Perfect, CancellationToken.None))!.Accepted);

        using var forced = await PostAsync(host, PairPath + "/baseline/accept", cookie, [new("csrf", csrf), new("run_id", Id(latest.Id)), new("force", "true"), new("reason", "gross is derived now")]);
        Assert.Equal(HttpStatusCode.SeeOther, forced.StatusCode);
        var baseline = (await scenario.History.GetBaselineAsync(DashboardScenario.Perfect, CancellationToken.None))!;
        Assert.True(baseline.Accepted);
        Assert.Equal((1, latest.StartedAt), (baseline.RunCount, baseline.CoversFrom));
        var entry = Assert.Single(await Audit(host).ListAsync(null, 10, CancellationToken.None));
        Assert.Equal((AuditAction.BaselineAccept, latest.Id), (entry.Action, entry.RunId!.Value));
        Assert.Contains("accepted despite critical findings", entry.Detail, StringComparison.Ordinal);
    }

    internal static async Task<long> OpenAlertAsync(DashboardScenario scenario) =>
        (await scenario.Alerts.GetOpenAlertsAsync([DashboardScenario.Perfect], CancellationToken.None)).Single().Id;

    private static IAuditStore Audit(DashboardHost host) => host.Server.Services.GetRequiredService<IAuditStore>();

    private static string Id(long id) => id.ToString(System.Globalization.CultureInfo.InvariantCulture);

    /// <summary>Signs in through the form; returns the "name=value" of the session cookie.</summary>
    private static async Task<string> SignInAsync(DashboardHost host, KeyValuePair<string, string>[] fields)
    {
        using var response = await host.Client.PostAsync(new Uri("/login", UriKind.Relative), new FormUrlEncodedContent(fields));
        Assert.Equal(HttpStatusCode.Redirect, response.StatusCode);
        var cookie = response.Headers.GetValues("Set-Cookie").Single().Split(';')[0];
        Assert.StartsWith(DashboardAccess.CookieName + "=", cookie, StringComparison.Ordinal);
        return cookie;
    }

    private static async Task<string> CsrfAsync(DashboardHost host, string cookie)
    {
        var (status, page) = await GetAsync(host, PairPath, cookie);
        Assert.Equal(200, status);
        var tokens = CsrfField().Matches(page).Select(m => m.Groups[1].Value).Distinct().ToArray();
        return Assert.Single(tokens);
    }

    private static async Task<(int Status, string Body)> GetAsync(DashboardHost host, string path, string? cookie)
    {
        using var request = new HttpRequestMessage(HttpMethod.Get, path);
        if (cookie is not null)
        {
            request.Headers.Add("Cookie", cookie);
        }

        using var response = await host.Client.SendAsync(request);
        return ((int)response.StatusCode, await response.Content.ReadAsStringAsync());
    }

    private static async Task<HttpResponseMessage> PostAsync(DashboardHost host, string path, string? cookie, KeyValuePair<string, string>[] fields)
    {
        using var request = new HttpRequestMessage(HttpMethod.Post, path) { Content = new FormUrlEncodedContent(fields) };
        if (cookie is not null)
        {
            request.Headers.Add("Cookie", cookie);
        }

        return await host.Client.SendAsync(request);
    }

    [GeneratedRegex("name=\"csrf\" value=\"([0-9a-f]{64})\"")]
    private static partial Regex CsrfField();

    [GeneratedRegex("<table id=\"audit\".*?</table>", RegexOptions.Singleline)]
    private static partial Regex AuditTable();
}
