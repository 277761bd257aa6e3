using System.Text.RegularExpressions;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Triage;
using DriftWatch.Dashboard;
using DriftWatch.Store;
using DriftWatch.Tests.Dashboard;
using DriftWatch.Triage;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using Microsoft.Playwright;

namespace DriftWatch.BrowserTests.Dashboard;

/// <summary>
/// Triage in a real headless Chromium, on a dashboard that asks for its access token: an engineer signs in with
/// the token and their name, acknowledges the confirmed alert, snoozes the pair and accepts a healthy run as the
/// baseline, each through the pair page's forms; the audit log on the page and in the store shows all three.
/// </summary>
public sealed class TriageBrowserTests : IAsyncLifetime
{
    private const string Token = "r3Vn8qLx2Wm5Tz9Kp4Hs";
    private const string Engineer = "Mira Castell";

    private DashboardScenario _scenario = null!;
    private DashboardServer _server = null!;
    private IPlaywright _playwright = null!;
    private IBrowser _browser = null!;
    private readonly List<string> _scriptErrors = [];

    public async Task InitializeAsync()
    {
        _scenario = await DashboardScenario.CreateAsync();
        var config = _scenario.Config with { Dashboard = new DashboardConfig { Bind = "0.0.0.0", AccessToken = Token } };
        _server = await DashboardServer.StartAsync(
            new DashboardServerOptions(config, _scenario.Database, _scenario.History, _scenario.Alerts)
            {
                Time = DashboardScenario.Clock,
                Listen = new System.Net.IPEndPoint(System.Net.IPAddress.Loopback, 0),
                Logging = b => b.SetMinimumLevel(LogLevel.Warning),
            },
            CancellationToken.None);
        (_playwright, _browser) = await Chromium.LaunchAsync();
    }

    public async Task DisposeAsync()
    {
        await _browser.DisposeAsync();
        _playwright.Dispose();
        await _server.DisposeAsync();
        await _scenario.DisposeAsync();
    }

    [Fact]
    public async Task SignIn_Ack_Snooze_AcceptABaseline_ThroughThePairPage_AllInTheAuditLog()
    {
        var alert = (await _scenario.Alerts.GetOpenAlertsAsync([DashboardScenario.Perfect], CancellationToken.None)).Single();
        var healthyRun = (await _scenario.History.GetRunsAsync(DashboardScenario.Perfect, DashboardScenario.Cycles, includePoints: false, CancellationToken.None))
            .First(r => r.Status == Core.History.RunStatus.Succeeded && r.Findings.Count == 0);
        var page = await NewPageAsync();

        // The pair page without a session leads to the sign-in form, which asks for the token and a name.
        await page.GotoAsync(_server.Address + "pairs/" + Uri.EscapeDataString(DashboardScenario.Perfect));
        await page.WaitForURLAsync(new Regex("/login\\?next="));
        await page.Locator("input[name=token]").FillAsync(Token);
        await page.Locator("input[name=name]").FillAsync(Engineer);
        await page.Locator("form[action='/login'] button[type=submit]").ClickAsync();
        await page.WaitForURLAsync(new Regex("/pairs/invoices\\.gross_vs_net$"));
        Assert.Contains("Acting as " + Engineer, await page.Locator("#triage .acting-as").InnerTextAsync(), StringComparison.Ordinal);

        // Acknowledge the confirmed alert.
        var ack = page.Locator($"#form-ack-{alert.Id}");
        await ack.Locator("input[name=reason]").FillAsync("billing job derives gross now; change reviewed");
        await ack.Locator("button").ClickAsync();
        await page.WaitForURLAsync(new Regex("#triage$"));
        Assert.Contains("acknowledged", await page.Locator($"#form-ack-{alert.Id}").InnerTextAsync(), StringComparison.Ordinal);

        // Snooze the pair for two days.
        var snooze = page.Locator("#form-snooze");
        await snooze.Locator("input[name=for]").FillAsync("2d");
        await snooze.Locator("input[name=reason]").FillAsync("invoice backfill until Wednesday");
        await snooze.Locator("button").ClickAsync();
        await page.Locator("#triage .snoozed").WaitForAsync();
        Assert.Contains("invoice backfill until Wednesday", await page.Locator("#triage .snoozed").InnerTextAsync(), StringComparison.Ordinal);

        // Accept a run without findings as the baseline.
        var accept = page.Locator("#form-accept");
        await accept.Locator("select[name=run_id]").SelectOptionAsync(healthyRun.Id.ToString(System.Globalization.CultureInfo.InvariantCulture));
        await accept.Locator("input[name=reason]").FillAsync("last run before the billing change");
        await accept.Locator("button").ClickAsync();
        await page.Locator("#audit tbody tr[data-action=baseline_accept]").WaitForAsync();

        // The page's audit log, newest first.
        var rows = page.Locator("#audit tbody tr");
        Assert.Equal(3, await rows.CountAsync());
        Assert.Equal(["baseline_accept", "snooze", "ack"], await rows.EvaluateAllAsync<string[]>("rs => rs.map(r => r.dataset.action)"));
        foreach (var cells in new[] { await rows.Nth(0).Locator("td").AllInnerTextsAsync(), await rows.Nth(2).Locator("td").AllInnerTextsAsync() })
        {
            Assert.Equal(Engineer, cells[1]);
            Assert.Equal("dashboard", cells[2]);
        }

        Assert.Equal("#" + alert.Id, (await rows.Nth(2).Locator("td").AllInnerTextsAsync())[4]);
        Assert.Equal(healthyRun.Id.ToString(System.Globalization.CultureInfo.InvariantCulture), (await rows.Nth(0).Locator("td").AllInnerTextsAsync())[5]);

        // And in the store.
        var audit = _server.Services.GetRequiredService<IAuditStore>();
        var entries = await audit.ListAsync(DashboardScenario.Perfect, 10, CancellationToken.None);
        Assert.Equal([AuditAction.BaselineAccept, AuditAction.Snooze, AuditAction.Ack], entries.Select(e => e.Action));
        Assert.All(entries, e => Assert.Equal((Engineer, Actor.ViaDashboard), (e.Actor, e.Via)));
        Assert.Equal("billing job derives gross now; change reviewed", entries[2].Reason);
        Assert.Equal(DashboardScenario.Now, (await _scenario.Alerts.GetAlertAsync(alert.Id, CancellationToken.None))!.AckedAt);
        Assert.Equal(DashboardScenario.Now.AddDays(2), Assert.Single(await _scenario.Alerts.ListSnoozesAsync(DashboardScenario.Now, CancellationToken.None)).Until);
        var baseline = (await _scenario.History.GetBaselineAsync(DashboardScenario.Perfect, CancellationToken.None))!;
        Assert.True(baseline.Accepted);
        Assert.Equal(healthyRun.StartedAt, baseline.CoversFrom);
        Assert.Empty(_scriptErrors);
    }

    private async Task<IPage> NewPageAsync()
    {
        var context = await _browser.NewContextAsync(new BrowserNewContextOptions
        {
            ViewportSize = new ViewportSize { Width = 1440, Height = 900 },
            TimezoneId = "UTC",
            Locale = "en-GB",
        });
        var page = await context.NewPageAsync();
        page.PageError += (_, message) => _scriptErrors.Add(message);
        page.Console += (_, message) =>
        {
            if (message.Type == "error")
            {
                _scriptErrors.Add(message.Text);
            }
        };
        return page;
    }
}
