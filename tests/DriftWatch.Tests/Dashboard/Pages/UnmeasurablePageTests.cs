using System.Text.Json;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Tests.Dashboard.Pages;

/// <summary>
/// A pair without a baseline never reads "as it did in the baseline", and a check with nothing to measure is shown
/// as unmeasurable (overview, pair page banner, history row, API), never as healthy.
/// </summary>
public sealed class UnmeasurablePageTests
{
    private const string AsInTheBaseline = "looks as it did in the baseline";

    // Anscombe (1973), set 1: eleven rows, r = 0.816 (published data; measurable at the default 10 usable rows).
    private static readonly PairedSample Anscombe1 = new(
        [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5],
        [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68]);

    [Fact]
    public async Task PairWithoutBaseline_SaysHowManyMeasurableRunsItNeeds_ThenAnUnmeasurableRunShowsEverywhere()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        var pair = DashboardScenario.Young; // first_runs: 5
        var start = DashboardScenario.Start;
        var profile = Profiler.Profile(Anscombe1, Thresholds.Default);
        Assert.Null(Measurability.Assess(profile, null, Thresholds.Default, "x", "y"));
        for (var i = 0; i < 2; i++)
        {
            await scenario.History.RecordRunAsync(
                new NewRun(pair, start.AddHours(i), start.AddHours(i).AddSeconds(1), RunStatus.Succeeded, null, profile, [], null, Anscombe1, "all"),
                CancellationToken.None);
        }

        await using (var host = await DashboardHost.StartAsync(scenario))
        {
            var (_, page) = await host.GetAsync("/pairs/" + pair);
            Assert.DoesNotContain(AsInTheBaseline, page, StringComparison.Ordinal);
            Assert.Contains("There is no baseline yet, so nothing was compared; the baseline (first_runs: 5) needs 3 more measurable runs.", page, StringComparison.Ordinal);
        }

        // The window's load is late: no rows. Recorded as PairChecker records it.
        var empty = Profiler.Profile(PairedSample.Empty, Thresholds.Default);
        var reason = Measurability.Assess(empty, null, Thresholds.Default, "distance_km", "fuel_l")!;
        await scenario.History.RecordRunAsync(
            new NewRun(pair, start.AddHours(2), start.AddHours(2).AddSeconds(1), RunStatus.Unmeasurable, reason, empty, [], null, null, "all"),
            CancellationToken.None);

        await using var after = await DashboardHost.StartAsync(scenario);
        var (_, overview) = await after.GetAsync("/");
        var row = PageHtml.OverviewRows(overview).Single(r => r.Pair == pair);
        Assert.Equal("unmeasurable", row.Status);
        Assert.Contains(reason, row.Markup, StringComparison.Ordinal);

        var (_, detail) = await after.GetAsync("/pairs/" + pair);
        Assert.Contains("Unmeasurable: the latest check had nothing to measure. </strong>" + reason, detail, StringComparison.Ordinal);
        Assert.Contains("<span class=\"outcome outcome-failed\">unmeasurable</span>", detail, StringComparison.Ordinal);
        Assert.DoesNotContain(AsInTheBaseline, detail, StringComparison.Ordinal);

        var (_, api) = await after.GetAsync("/api/pairs");
        using var json = JsonDocument.Parse(api);
        var entry = json.RootElement.GetProperty("pairs").EnumerateArray().Single(p => p.GetProperty("name").GetString() == pair);
        Assert.Equal("unmeasurable", entry.GetProperty("status").GetString());
        Assert.Equal("unmeasurable", entry.GetProperty("latest_run").GetProperty("status").GetString());
        Assert.Equal(reason, entry.GetProperty("latest_run").GetProperty("error").GetString());
    }
}
