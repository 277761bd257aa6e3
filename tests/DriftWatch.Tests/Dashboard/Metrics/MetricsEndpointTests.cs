using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Dashboard.Metrics;

namespace DriftWatch.Tests.Dashboard.Metrics;

/// <summary>/metrics against the OpenMetrics 1.0 rules (see <see cref="OpenMetricsChecker"/>) and the runs actually recorded.</summary>
public sealed class MetricsEndpointTests
{
    [Fact]
    public async Task Metrics_CountsRunsRecordedAfterTheFirstScrape_AsSpecConformantCounterGaugeAndHistogram()
    {
        await using var scenario = await DashboardScenario.CreateAsync();
        await using var host = await DashboardHost.StartAsync(scenario);

        using var first = await host.Client.GetAsync(new Uri("/metrics", UriKind.Relative));
        Assert.Equal(200, (int)first.StatusCode);
        // "Overall Structure": the content type MUST be exactly this.
        Assert.Equal(OpenMetricsText.ContentType, first.Content.Headers.ContentType!.ToString());
        var before = OpenMetricsChecker.Parse(await first.Content.ReadAsStringAsync());
        Assert.All(before["driftwatch_runs"].Samples.Where(s => s.Name == "driftwatch_runs_total"), s => Assert.Equal(0, s.Number));

        // Three checks of the healthy pair after the first scrape: 0.2 s and 1.5 s succeeded, 40 s failed.
        var at = DashboardScenario.Now;
        await Record(scenario, at, TimeSpan.FromMilliseconds(200), RunStatus.Succeeded);
        await Record(scenario, at.AddMinutes(1), TimeSpan.FromMilliseconds(1500), RunStatus.Succeeded);
        await Record(scenario, at.AddMinutes(2), TimeSpan.FromSeconds(40), RunStatus.Failed);

        var (status, text) = await host.GetAsync("/metrics");
        Assert.Equal(200, status);
        var families = OpenMetricsChecker.Parse(text);

        var runs = families["driftwatch_runs"];
        Assert.Equal("counter", runs.Type);
        Assert.Equal(2, Value(runs, "driftwatch_runs_total", ("pair", DashboardScenario.Healthy), ("status", "succeeded")));
        Assert.Equal(1, Value(runs, "driftwatch_runs_total", ("pair", DashboardScenario.Healthy), ("status", "failed")));
        Assert.Equal(0, Value(runs, "driftwatch_runs_total", ("pair", DashboardScenario.Perfect), ("status", "succeeded")));
        // Every run status has its series from the first scrape on, unmeasurable included.
        Assert.Equal(0, Value(runs, "driftwatch_runs_total", ("pair", DashboardScenario.Healthy), ("status", "unmeasurable")));
        // _created: when counting started, the first scrape (the fixed clock), in Unix seconds.
        Assert.Equal(at.ToUnixTimeSeconds(), Value(runs, "driftwatch_runs_created", ("pair", DashboardScenario.Healthy), ("status", "failed")));

        var open = families["driftwatch_open_alerts"];
        Assert.Equal("gauge", open.Type);
        var stored = await scenario.Alerts.GetOpenAlertsAsync(null, CancellationToken.None);
        foreach (var severity in Enum.GetValues<Severity>())
        {
            var name = DriftWatch.Output.JsonContract.Name(severity);
            Assert.Equal(stored.Count(a => a.Severity == severity), Value(open, "driftwatch_open_alerts", ("severity", name)));
        }

        Assert.True(Value(open, "driftwatch_open_alerts", ("severity", "critical")) >= 2, "became_perfect and check_failing are open and critical");

        var duration = families["driftwatch_check_duration_seconds"];
        Assert.Equal("histogram", duration.Type);
        Assert.Equal("seconds", duration.Unit);
        var expected = new Dictionary<string, double>
        {
            ["0.05"] = 0, ["0.1"] = 0, ["0.25"] = 1, ["0.5"] = 1, ["1.0"] = 1, ["2.5"] = 2, ["5.0"] = 2,
            ["10.0"] = 2, ["30.0"] = 2, ["60.0"] = 3, ["120.0"] = 3, ["300.0"] = 3, ["+Inf"] = 3,
        };
        foreach (var (le, count) in expected)
        {
            Assert.Equal(count, Value(duration, "driftwatch_check_duration_seconds_bucket", ("le", le)));
        }

        Assert.Equal(3, Value(duration, "driftwatch_check_duration_seconds_count"));
        Assert.Equal(41.7, Value(duration, "driftwatch_check_duration_seconds_sum"), 9);
    }

    private static double Value(OmFamily family, string name, params (string Key, string Value)[] labels) =>
        family.Samples.Single(s => s.Name == name && s.Labels.Count == labels.Length && labels.All(l => s.Labels.GetValueOrDefault(l.Key) == l.Value)).Number;

    private static Task<long> Record(DashboardScenario scenario, DateTimeOffset started, TimeSpan took, RunStatus status) =>
        scenario.History.RecordRunAsync(
            new NewRun(DashboardScenario.Healthy, started, started + took, status, status == RunStatus.Failed ? "timeout" : null, null, [], null, null),
            CancellationToken.None);
}
