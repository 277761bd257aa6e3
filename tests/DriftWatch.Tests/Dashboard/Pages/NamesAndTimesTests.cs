using System.Text.RegularExpressions;
using DriftWatch.Dashboard.Export;

namespace DriftWatch.Tests.Dashboard.Pages;

/// <summary>How the pages print pair names, column order and times: served (live) against exported (static).</summary>
[Collection(DashboardScenarioGroup.Name)]
public sealed partial class NamesAndTimesTests(DashboardFixture fixture) : IDisposable
{
    private readonly string _out = Path.Combine(Path.GetTempPath(), "driftwatch-times-" + Guid.NewGuid().ToString("N")[..10]);

    [Fact]
    public async Task Overview_PairNamesMayWrapOnlyAfterTheirSeparators_AndColumnsReadXVsY()
    {
        var (_, html) = await fixture.Host.GetAsync("/");

        Assert.Contains("class=\"pair-name\">orders.<wbr>total_<wbr>vs_<wbr>items</a>", html, StringComparison.Ordinal);
        // x before y, as `history` prints it and the configuration names them (item_count is x, order_total y).
        Assert.Contains("item_count vs order_total", html, StringComparison.Ordinal);
        Assert.DoesNotContain("order_total vs item_count", html, StringComparison.Ordinal);
        var css = (await fixture.Host.GetAsync("/assets/dashboard.css")).Body;
        Assert.DoesNotContain("break-all", css, StringComparison.Ordinal);
    }

    [Fact]
    public async Task LivePages_SayHowLongAgo_WithTheAbsoluteTimeInTheTitle()
    {
        var (_, html) = await fixture.Host.GetAsync("/");

        // The scenario's clock is 20 minutes after the last check at 2026-11-30 18:00 UTC.
        Assert.Matches("<time datetime=\"2026-11-30T18:00:\\d\\dZ\" title=\"2026-11-30 18:00 UTC\">20 min ago</time>", html);
    }

    [Fact]
    public async Task StaticReport_GivesAbsoluteTimesOnly_NeverHowLongAgo()
    {
        var scenario = fixture.Scenario;
        await StaticReport.WriteAsync(scenario.Config, scenario.History, scenario.Alerts, scenario.Outbox, _out, null, DashboardScenario.Clock, CancellationToken.None);

        foreach (var file in Directory.EnumerateFiles(_out, "*.html", SearchOption.AllDirectories))
        {
            var html = await File.ReadAllTextAsync(file);
            Assert.DoesNotMatch(Relative(), html);
        }

        var index = await File.ReadAllTextAsync(Path.Combine(_out, "index.html"));
        Assert.Matches("<time datetime=\"2026-11-30T18:00:\\d\\dZ\">2026-11-30 18:00 UTC</time>", index);
    }

    public void Dispose()
    {
        if (Directory.Exists(_out))
        {
            Directory.Delete(_out, recursive: true);
        }
    }

    [GeneratedRegex(@"just now|\d+ (min|h|d) ago|\bin \d+ (min|h|d)\b")]
    private static partial Regex Relative();
}
