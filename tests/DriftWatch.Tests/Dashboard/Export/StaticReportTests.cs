using System.Net;
using System.Text.RegularExpressions;
using DriftWatch.Dashboard.Export;

namespace DriftWatch.Tests.Dashboard.Export;

[Collection(DashboardScenarioGroup.Name)]
public sealed class StaticReportTests(DashboardFixture fixture) : IDisposable
{
    private readonly string _out = Path.Combine(Path.GetTempPath(), "driftwatch-report-" + Guid.NewGuid().ToString("N")[..10]);

    [Fact]
    public async Task WriteAsync_AllPairs_SelfContainedPagesWhoseLinksResolve()
    {
        var scenario = fixture.Scenario;
        var result = await StaticReport.WriteAsync(scenario.Config, scenario.History, scenario.Alerts, scenario.Outbox, _out, null, DashboardScenario.Clock, CancellationToken.None);

        Assert.Equal(2 + scenario.Config.Pairs.Count, result.Files.Count);
        Assert.Contains("index.html", result.Files);
        Assert.Contains("alerts.html", result.Files);
        foreach (var file in result.Files)
        {
            var path = Path.Combine(_out, file);
            var html = await File.ReadAllTextAsync(path);
            // Self-contained: CSS and script inline, no stylesheet or script fetched, nothing from the network.
            Assert.Contains("<style>", html, StringComparison.Ordinal);
            Assert.DoesNotContain("<link rel=\"stylesheet\"", html, StringComparison.Ordinal);
            Assert.DoesNotContain("<script src", html, StringComparison.Ordinal);
            Assert.DoesNotMatch("(src|href|action)=\"(https?:)?//", html);
            Assert.DoesNotContain("<script>alert", html, StringComparison.Ordinal);
            foreach (Match link in Regex.Matches(html, "href=\"(?!data:)([^\"#?]+)[^\"]*\""))
            {
                var target = Path.GetFullPath(Path.Combine(Path.GetDirectoryName(path)!, Uri.UnescapeDataString(WebUtility.HtmlDecode(link.Groups[1].Value))));
                Assert.True(File.Exists(target), $"{file} links to {link.Groups[1].Value}, which was not written");
            }
        }

        var index = await File.ReadAllTextAsync(Path.Combine(_out, "index.html"));
        Assert.Contains("href=\"pairs/invoices.gross_vs_net.html\"", index, StringComparison.Ordinal);
        var pair = await File.ReadAllTextAsync(Path.Combine(_out, "pairs", "invoices.gross_vs_net.html"));
        Assert.Equal(1 + 5, Regex.Count(pair, "<svg "));
        Assert.Equal(DashboardScenario.Cycles, Regex.Count(pair, "<tr data-run-id="));
        Assert.Contains("href=\"../index.html\"", pair, StringComparison.Ordinal);
    }

    [Fact]
    public async Task WriteAsync_OnePair_WritesItsPageAndNarrowsOverviewAndAlerts()
    {
        var scenario = fixture.Scenario;
        var result = await StaticReport.WriteAsync(scenario.Config, scenario.History, scenario.Alerts, scenario.Outbox, _out, DashboardScenario.Failing, DashboardScenario.Clock, CancellationToken.None);

        Assert.Equal(["index.html", "alerts.html", "pairs/meters.power_vs_load.html"], result.Files);
        var index = await File.ReadAllTextAsync(Path.Combine(_out, "index.html"));
        Assert.Equal(1, Regex.Count(index, "<tr data-status="));
        var alerts = await File.ReadAllTextAsync(Path.Combine(_out, "alerts.html"));
        Assert.Contains("check failing", alerts, StringComparison.Ordinal);
        Assert.DoesNotContain("became perfect", alerts, StringComparison.Ordinal);
    }

    [Fact]
    public async Task WriteAsync_UnknownPair_Throws()
    {
        var scenario = fixture.Scenario;
        var error = await Assert.ThrowsAsync<KeyNotFoundException>(() =>
            StaticReport.WriteAsync(scenario.Config, scenario.History, scenario.Alerts, scenario.Outbox, _out, "nope", DashboardScenario.Clock, CancellationToken.None));
        Assert.Contains("'nope'", error.Message, StringComparison.Ordinal);
    }

    public void Dispose()
    {
        if (Directory.Exists(_out))
        {
            Directory.Delete(_out, recursive: true);
        }
    }
}
