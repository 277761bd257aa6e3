using System.Text.RegularExpressions;
using DriftWatch.Dashboard;
using DriftWatch.Dashboard.Export;
using DriftWatch.Tests.Dashboard;
using Microsoft.Extensions.Logging;
using Microsoft.Playwright;

namespace DriftWatch.BrowserTests.Dashboard;

/// <summary>
/// The dashboard in a real headless Chromium: an engineer opens the overview during an incident, narrows it to
/// the broken pairs, opens one and reads its history and plots. Screenshots land in the test output folder
/// (screenshots/); the README's copies in docs/images/ are taken from there.
/// </summary>
public sealed partial class DashboardBrowserTests : IAsyncLifetime
{
    private DashboardScenario _scenario = null!;
    private DashboardServer _server = null!;
    private IPlaywright _playwright = null!;
    private IBrowser _browser = null!;

    // Script errors and console errors of every page; a test ends by asserting there were none.
    private readonly List<string> _scriptErrors = [];

    private static string Screenshots => Path.Combine(AppContext.BaseDirectory, "screenshots");

    public async Task InitializeAsync()
    {
        _scenario = await DashboardScenario.CreateAsync();
        _server = await DashboardServer.StartAsync(
            new DashboardServerOptions(_scenario.Config, _scenario.Database, _scenario.History, _scenario.Alerts)
            {
                Time = DashboardScenario.Clock,
                Listen = new System.Net.IPEndPoint(System.Net.IPAddress.Loopback, 0),
                Logging = b => b.SetMinimumLevel(LogLevel.Warning),
            },
            CancellationToken.None);
        (_playwright, _browser) = await Chromium.LaunchAsync();
        Directory.CreateDirectory(Screenshots);
    }

    public async Task DisposeAsync()
    {
        await _browser.DisposeAsync();
        _playwright.Dispose();
        await _server.DisposeAsync();
        await _scenario.DisposeAsync();
    }

    [Fact]
    public async Task Overview_FilterByStatus_ThenOpenAPair_ShowsItsHistoryAndPlots()
    {
        var page = await NewPageAsync();
        await page.GotoAsync(_server.Address + "");

        // Worst first: the confirmed pair leads; the tally counts one of each state.
        var rows = page.Locator("#pairs tbody tr");
        Assert.Equal(4, await rows.CountAsync());
        Assert.Equal("confirmed", await rows.Nth(0).GetAttributeAsync("data-status"));
        Assert.Equal("1", await page.Locator(".tile.st-confirmed .tile-n").InnerTextAsync());
        Assert.Equal("1", await page.Locator(".tile.st-failing .tile-n").InnerTextAsync());
        Assert.Contains("statistical signals, not proof", await page.Locator("footer").InnerTextAsync(), StringComparison.Ordinal);
        await page.ScreenshotAsync(new PageScreenshotOptions { Path = Path.Combine(Screenshots, "dashboard-overview.png"), FullPage = true });

        // Filter by status: only the failing pair stays visible, the address remembers the filter.
        await page.Locator("select[name=status]").SelectOptionAsync("failing");
        var visible = page.Locator("#pairs tbody tr:visible");
        Assert.Equal(1, await visible.CountAsync());
        Assert.Equal(DashboardScenario.Failing, await visible.Locator(".pair-name").InnerTextAsync());
        Assert.Equal("1 of 4 shown", await page.Locator("output.shown").InnerTextAsync());
        Assert.EndsWith("?status=failing", page.Url, StringComparison.Ordinal);

        // Free text on top of no status filter, then the tiles as filters.
        await page.Locator("select[name=status]").SelectOptionAsync(string.Empty);
        await page.Locator("input[name=q]").FillAsync("gross");
        Assert.Equal(DashboardScenario.Perfect, await page.Locator("#pairs tbody tr:visible .pair-name").InnerTextAsync());
        await page.Locator("input[name=q]").FillAsync(string.Empty);
        await page.Locator(".tile.st-healthy").ClickAsync();
        Assert.Equal(DashboardScenario.Healthy, await page.Locator("#pairs tbody tr:visible .pair-name").InnerTextAsync());
        await page.Locator(".tile.tile-all").ClickAsync();
        Assert.Equal(4, await visible.CountAsync());

        // Sorting by pair name: ascending, then descending on a second click.
        await page.Locator("th[data-key=pair] button").ClickAsync();
        var names = await page.Locator("#pairs tbody tr .pair-name").AllInnerTextsAsync();
        Assert.Equal(names.Order(StringComparer.Ordinal), names);
        Assert.Equal("ascending", await page.Locator("th[data-key=pair]").GetAttributeAsync("aria-sort"));
        await page.Locator("th[data-key=pair] button").ClickAsync();
        names = await page.Locator("#pairs tbody tr .pair-name").AllInnerTextsAsync();
        Assert.Equal(names.OrderDescending(StringComparer.Ordinal), names);

        // Into the confirmed pair.
        await page.Locator("a.pair-name", new PageLocatorOptions { HasText = DashboardScenario.Perfect }).ClickAsync();
        await page.WaitForURLAsync(new Regex("/pairs/invoices\\.gross_vs_net$"));
        Assert.Contains(DashboardScenario.Perfect, await page.Locator("h1").InnerTextAsync(), StringComparison.Ordinal);
        Assert.Contains("became perfect", await page.Locator(".findings").InnerTextAsync(), StringComparison.Ordinal);

        var history = page.Locator("#runs tbody tr");
        Assert.Equal(DashboardScenario.Cycles, await history.CountAsync());
        var newest = await history.Nth(0).Locator("td").AllInnerTextsAsync();
        Assert.StartsWith("2026-11-30 18:00:03 UTC", newest[0], StringComparison.Ordinal);
        Assert.Equal("300", newest[2]);
        Assert.Equal("1.000", newest[3]);
        Assert.Contains("became perfect", newest[11], StringComparison.Ordinal);
        var oldest = await history.Nth(DashboardScenario.Cycles - 1).Locator("td").AllInnerTextsAsync();
        Assert.Equal("none", oldest[11]);

        // The plots are inline SVG, drawn at a readable size, with the columns as axis labels.
        var scatter = page.Locator("#scatter svg");
        Assert.True(await scatter.IsVisibleAsync());
        Assert.Equal(1, await scatter.Locator("text", new LocatorLocatorOptions { HasTextRegex = ExactText("net_amount") }).CountAsync());
        Assert.Equal(1, await scatter.Locator("text", new LocatorLocatorOptions { HasTextRegex = ExactText("gross_amount") }).CountAsync());
        var box = await scatter.BoundingBoxAsync();
        Assert.True(box!.Width > 400, $"scatter plot only {box.Width}px wide");
        Assert.Equal(1, await page.Locator("#trend svg text", new PageLocatorOptions { HasTextRegex = ExactText("Pearson r") }).CountAsync());
        await page.ScreenshotAsync(new PageScreenshotOptions { Path = Path.Combine(Screenshots, "dashboard-pair.png"), FullPage = true });
        Assert.Empty(_scriptErrors);
    }

    [Fact]
    public async Task StaticExport_OpenedFromDisk_FiltersAndLinksWithoutAServer()
    {
        var folder = Path.Combine(Path.GetTempPath(), "driftwatch-export-" + Guid.NewGuid().ToString("N")[..10]);
        try
        {
            await StaticReport.WriteAsync(_scenario.Config, _scenario.History, _scenario.Alerts, _scenario.Outbox, folder, null, DashboardScenario.Clock, CancellationToken.None);
            var page = await NewPageAsync();
            var failedRequests = new List<string>();
            page.RequestFailed += (_, request) => failedRequests.Add(request.Url);

            await page.GotoAsync(new Uri(Path.Combine(folder, "index.html")).AbsoluteUri);
            await page.Locator("select[name=status]").SelectOptionAsync("confirmed");
            Assert.Equal(1, await page.Locator("#pairs tbody tr:visible").CountAsync());

            // A page opened from disk is waited for by its content, not by WaitForURL: that waits for the "load" event
            // after the URL matches, and once in a CI run the event of a file:// navigation never reached it (30 s
            // timeout with the page shown). The pages are written whole, so their last rows mean they are parsed.
            await page.Locator("a.pair-name", new PageLocatorOptions { HasText = DashboardScenario.Perfect }).ClickAsync();
            await page.Locator("#runs tbody tr").Nth(DashboardScenario.Cycles - 1).WaitForAsync(new LocatorWaitForOptions { State = WaitForSelectorState.Attached });
            Assert.Matches(new Regex("pairs/invoices\\.gross_vs_net\\.html$"), page.Url);
            Assert.Equal(DashboardScenario.Cycles, await page.Locator("#runs tbody tr").CountAsync());
            await page.Locator("#scatter svg").WaitForAsync();

            await page.Locator("nav a", new PageLocatorOptions { HasText = "Alerts" }).ClickAsync();
            await page.Locator("#open-alerts").WaitForAsync();
            Assert.Matches(new Regex("alerts\\.html$"), page.Url);
            Assert.Contains("became perfect", await page.Locator("#open-alerts").InnerTextAsync(), StringComparison.Ordinal);
            Assert.Empty(failedRequests);
            Assert.Empty(_scriptErrors);
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    private static Regex ExactText(string text) => new("^" + Regex.Escape(text) + "$");

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
