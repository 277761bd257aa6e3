using System.Text.Json;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Tests.Dashboard;

namespace DriftWatch.Tests.Cli;

/// <summary>
/// <c>alerts list</c> over a store the real pipeline filled (<see cref="DashboardScenario"/>: profiler, findings,
/// lifecycle, alert store), plus one info sighting the lifecycle records for a pair: info is not an alert.
/// </summary>
public sealed class AlertsListTests : IAsyncLifetime
{
    private DashboardScenario _scenario = null!;
    private string _config = null!;

    public async Task InitializeAsync()
    {
        _scenario = await DashboardScenario.CreateAsync(hostile: true);
        // One more cycle in which the healthy pair shows an info finding: the lifecycle keeps it as a watching row.
        var info = new Finding(FindingKind.Curvature, Severity.Info, 0.03, 0.1, "a slight bend (invented for this test)");
        var open = await _scenario.Alerts.GetOpenAlertsAsync(null, CancellationToken.None);
        var decision = AlertLifecycle.Evaluate(
            [PairOutcome.Success(DashboardScenario.Healthy, null, [info])], open, new Dictionary<string, DateTimeOffset>(), _scenario.Config.Alerting, DashboardScenario.Now);
        await _scenario.Alerts.ApplyCycleAsync(decision, [], null, CancellationToken.None);

        _config = Path.Combine(Path.GetDirectoryName(_scenario.StorePath)!, "cli.yaml");
        await File.WriteAllTextAsync(_config, $"""
            sources:
              - name: shop_db
                kind: sqlite
                connection: shop.db
            store:
              connection: {_scenario.StorePath}
            pairs:
              - name: {DashboardScenario.Healthy}
                source: shop_db
                table: sales.orders
                x: item_count
                y: order_total
            """);
    }

    [Fact]
    public async Task List_LeavesOutInfoSightings_ThatTheStoreKeeps()
    {
        var stored = await _scenario.Alerts.GetOpenAlertsAsync(null, CancellationToken.None);
        Assert.Contains(stored, a => a.Severity == Severity.Info && a.Pair == DashboardScenario.Healthy);

        var listed = await ListAsync();

        Assert.NotEmpty(listed);
        Assert.DoesNotContain(listed, a => a.Severity == "info");
        // Every stored open alert of warning or worse is listed.
        Assert.Equal(
            stored.Where(a => a.Severity > Severity.Info).Select(a => a.Id).Order(),
            listed.Where(a => a.Status != "cleared").Select(a => a.Id).Order());
    }

    [Fact]
    public async Task List_IsInTheDocumentedOrder_AndTheSameOnEveryCall()
    {
        var first = await ListAsync();
        var second = await ListAsync();

        Assert.Equal(first, second);
        Assert.True(first.Count >= 3, "the scenario has at least three alerts of warning or worse");
        // The documented order, written out independently: open before cleared, severity (critical first), confirmed
        // before watching, first seen newest first, id highest first.
        static int Severity(string s) => s switch { "critical" => 2, "warning" => 1, _ => 0 };
        static int State(string s) => s switch { "confirmed" => 0, "watching" => 1, _ => 2 };
        for (var i = 1; i < first.Count; i++)
        {
            var (a, b) = (first[i - 1], first[i]);
            var key = (A: (a.Status == "cleared" ? 1 : 0, -Severity(a.Severity), State(a.Status)), B: (b.Status == "cleared" ? 1 : 0, -Severity(b.Severity), State(b.Status)));
            Assert.True(
                key.A.CompareTo(key.B) < 0 || (key.A == key.B && (a.FirstSeen > b.FirstSeen || (a.FirstSeen == b.FirstSeen && a.Id > b.Id))),
                $"#{a.Id} ({a.Severity} {a.Status}) is listed before #{b.Id} ({b.Severity} {b.Status})");
        }

        // A critical confirmed alert comes before a warning.
        var firstWarning = first.FindIndex(a => a.Severity == "warning");
        var lastCritical = first.FindLastIndex(a => a.Severity == "critical" && a.Status != "cleared");
        Assert.True(lastCritical >= 0 && (firstWarning < 0 || lastCritical < firstWarning || first[firstWarning].Status == "cleared"));
    }

    private async Task<List<Listed>> ListAsync()
    {
        var run = await CliRun.Of("alerts", "list", "--config", _config, "--format", "json");
        Assert.Equal(0, run.ExitCode);
        using var json = JsonDocument.Parse(run.Out);
        return [.. json.RootElement.GetProperty("alerts").EnumerateArray().Select(a => new Listed(
            a.GetProperty("id").GetInt64(),
            a.GetProperty("severity").GetString()!,
            a.GetProperty("status").GetString()!,
            a.GetProperty("first_seen").GetDateTimeOffset()))];
    }

    public async Task DisposeAsync() => await _scenario.DisposeAsync();

    private sealed record Listed(long Id, string Severity, string Status, DateTimeOffset FirstSeen);
}
