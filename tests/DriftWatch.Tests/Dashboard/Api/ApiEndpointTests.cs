using System.Text.Json;
using MathNet.Numerics.Statistics;

namespace DriftWatch.Tests.Dashboard.Api;

[Collection(DashboardScenarioGroup.Name)]
public sealed class ApiEndpointTests(DashboardFixture fixture)
{
    private DashboardHost Host => fixture.Host;

    [Fact]
    public async Task Pairs_SnakeCaseContract_WithStatusesProfilesAndBaselines()
    {
        var (status, body) = await Host.GetAsync("/api/pairs");

        Assert.Equal(200, status);
        using var json = JsonDocument.Parse(body);
        var pairs = json.RootElement.GetProperty("pairs").EnumerateArray().ToDictionary(p => p.GetProperty("name").GetString()!);
        Assert.Equal(5, pairs.Count);
        Assert.Equal("confirmed", pairs[DashboardScenario.Perfect].GetProperty("status").GetString());
        Assert.Equal("failing", pairs[DashboardScenario.Failing].GetProperty("status").GetString());
        Assert.Equal("no_baseline", pairs[DashboardScenario.Young].GetProperty("status").GetString());
        Assert.Equal("healthy", pairs[DashboardScenario.Healthy].GetProperty("status").GetString());

        var perfect = pairs[DashboardScenario.Perfect];
        Assert.Equal("critical", perfect.GetProperty("worst_open_severity").GetString());
        var latest = perfect.GetProperty("latest_run");
        Assert.Equal("succeeded", latest.GetProperty("status").GetString());
        Assert.Contains(latest.GetProperty("findings").EnumerateArray(), f => f.GetProperty("kind").GetString() == "became_perfect" && f.GetProperty("severity").GetString() == "critical");
        Assert.True(latest.GetProperty("profile").GetProperty("exact_affine").GetBoolean());
        Assert.Equal("first_runs: 5", perfect.GetProperty("baseline").GetProperty("policy").GetString());

        // pearson_r of the latest healthy run against MathNet.Numerics over its stored points (independent oracle).
        var run = (await fixture.Scenario.History.GetRunsAsync(DashboardScenario.Healthy, 1, includePoints: true, CancellationToken.None))[0];
        var healthy = pairs[DashboardScenario.Healthy];
        Assert.Equal(Correlation.Pearson(run.Points!.X, run.Points.Y), healthy.GetProperty("latest_run").GetProperty("profile").GetProperty("pearson_r").GetDouble(), 12);
        var r0 = healthy.GetProperty("baseline").GetProperty("profile").GetProperty("pearson_r").GetDouble();
        Assert.Equal(run.Profile!.PearsonR!.Value - r0, healthy.GetProperty("delta_r").GetDouble(), 12);

        var failing = pairs[DashboardScenario.Failing].GetProperty("latest_run");
        Assert.Equal("failed", failing.GetProperty("status").GetString());
        Assert.Equal(DashboardScenario.SourceError, failing.GetProperty("error").GetString());
        Assert.Equal(JsonValueKind.Null, failing.GetProperty("profile").ValueKind);
        Assert.Equal(JsonValueKind.Null, pairs[DashboardScenario.Young].GetProperty("baseline").ValueKind);
    }

    [Fact]
    public async Task Runs_SecondPageOfFive_IsRunsSixToTenNewestFirst()
    {
        var (status, body) = await Host.GetAsync("/api/pairs/" + DashboardScenario.Healthy + "/runs?page=2&page_size=5");

        Assert.Equal(200, status);
        using var json = JsonDocument.Parse(body);
        var root = json.RootElement;
        Assert.Equal(2, root.GetProperty("page").GetInt32());
        Assert.Equal(5, root.GetProperty("page_size").GetInt32());
        Assert.Equal(4, root.GetProperty("page_count").GetInt32());
        Assert.Equal(DashboardScenario.Cycles, root.GetProperty("total_runs").GetInt32());
        var started = root.GetProperty("runs").EnumerateArray().Select(r => r.GetProperty("started_at").GetDateTimeOffset()).ToArray();
        // The healthy pair is checked first in every cycle, at the cycle's start: cycles 10 down to 6.
        Assert.Equal(Enumerable.Range(6, 5).Reverse().Select(c => DashboardScenario.Start + DashboardScenario.Interval * c), started);
    }

    [Fact]
    public async Task Runs_UnknownPair_Is404WithAMessage()
    {
        var (status, body) = await Host.GetAsync("/api/pairs/nope/runs");

        Assert.Equal(404, status);
        Assert.Equal("no pair named 'nope'", JsonDocument.Parse(body).RootElement.GetProperty("error").GetString());
    }

    [Fact]
    public async Task Alerts_OpenWithLifecycleTimes_AndDeliveries()
    {
        var (status, body) = await Host.GetAsync("/api/alerts");

        Assert.Equal(200, status);
        using var json = JsonDocument.Parse(body);
        var open = json.RootElement.GetProperty("open").EnumerateArray().ToArray();
        var perfect = open.Single(a => a.GetProperty("pair").GetString() == DashboardScenario.Perfect && a.GetProperty("kind").GetString() == "became_perfect");
        Assert.Equal("confirmed", perfect.GetProperty("status").GetString());
        // Critical findings are confirmed at the first run (alerting.critical_confirm_runs = 1): the first exact cycle, 12, plus a minute.
        Assert.Equal(DashboardScenario.Start + DashboardScenario.Interval * 12 + TimeSpan.FromMinutes(1), perfect.GetProperty("confirmed_at").GetDateTimeOffset());
        Assert.Equal(4, perfect.GetProperty("consecutive_runs").GetInt32());
        var failing = open.Single(a => a.GetProperty("kind").GetString() == "check_failing");
        Assert.Equal(3, failing.GetProperty("consecutive_runs").GetInt32());

        var deliveries = json.RootElement.GetProperty("deliveries").EnumerateArray().ToArray();
        Assert.Equal(fixture.Scenario.OutboxCount, deliveries.Length);
        Assert.Single(deliveries, d => d.GetProperty("state").GetString() == "retrying");
        Assert.All(deliveries.Where(d => d.GetProperty("state").GetString() == "sent"), d => Assert.Equal(JsonValueKind.Null, d.GetProperty("next_attempt_at").ValueKind));
    }
}
