using System.Globalization;
using System.Text.Json;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Monitoring;
using DriftWatch.Store;
using DriftWatch.Tests.Dashboard;

namespace DriftWatch.Tests.Cli;

/// <summary>
/// <c>baseline accept|reset</c>, <c>alerts ack</c> and <c>alerts log</c> over a real SQLite store holding the
/// dashboard scenario's history (the real pipeline's runs, findings, baselines and alerts). Each test has its own store.
/// </summary>
public sealed class TriageCommandTests : IAsyncLifetime
{
    private const string Pair = DashboardScenario.Perfect;
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "driftwatch-triagecmd-" + Guid.NewGuid().ToString("N")[..10]);
    private DashboardScenario _scenario = null!;
    private string _config = null!;

    public async Task InitializeAsync()
    {
        _scenario = await DashboardScenario.CreateAsync();
        Directory.CreateDirectory(_dir);
        _config = Path.Combine(_dir, "driftwatch.yaml");
        await File.WriteAllTextAsync(_config, $"""
            sources:
              - name: billing_db
                kind: sqlite
                connection: billing.db
            store:
              kind: sqlite
              connection: {_scenario.StorePath}
            pairs:
              - name: {Pair}
                source: billing_db
                table: invoices
                x: net_amount
                y: gross_amount
            """);
    }

    public async Task DisposeAsync()
    {
        await _scenario.DisposeAsync();
        Directory.Delete(_dir, recursive: true);
    }

    [Fact]
    public async Task Accept_TheLatestRunWithACriticalFinding_IsRefusedWithExitCode1_AndChangesNothing()
    {
        var before = (await _scenario.History.GetBaselineAsync(Pair, CancellationToken.None))!;
        var latest = (await _scenario.History.GetRunsAsync(Pair, 1, includePoints: false, CancellationToken.None))[0];
        Assert.Equal(Severity.Critical, latest.WorstSeverity);

        var run = await CliRun.Of("baseline", "accept", Pair, "--config", _config);

        Assert.Equal(1, run.ExitCode);
        Assert.Contains($"candidate: run {latest.Id} of ", run.Out, StringComparison.Ordinal);
        Assert.Contains($"run {latest.Id} of '{Pair}' has critical findings (became_perfect", run.Error, StringComparison.Ordinal);
        Assert.Contains("--force", run.Error, StringComparison.Ordinal);
        var after = (await _scenario.History.GetBaselineAsync(Pair, CancellationToken.None))!;
        Assert.Equal((before.CreatedAt, before.Accepted), (after.CreatedAt, after.Accepted));
        Assert.Empty(await new AuditStore(_scenario.Database).ListAsync(null, 10, CancellationToken.None));
    }

    [Fact]
    public async Task Accept_WithForce_AdoptsTheLatestRun_ShowsItsFigures_AndRecordsTheOperatingSystemUser()
    {
        var latest = (await _scenario.History.GetRunsAsync(Pair, 1, includePoints: false, CancellationToken.None))[0];

        var run = await CliRun.Of("baseline", "accept", Pair, "--force", "--reason", "gross is derived on purpose now", "--config", _config);

        Assert.Equal(0, run.ExitCode);
        // The figures printed are the run's own, as stored (Pearson r of an exact 1.2 × net is 1).
        var r = latest.Profile!.PearsonR!.Value.ToString("0.000", CultureInfo.InvariantCulture);
        Assert.Contains($"adopting run {latest.Id} of {latest.StartedAt.UtcDateTime:yyyy-MM-dd HH:mm} UTC: r {r}", run.Out, StringComparison.Ordinal);
        Assert.Contains("pooled from 1 runs", run.Out, StringComparison.Ordinal);
        var baseline = (await _scenario.History.GetBaselineAsync(Pair, CancellationToken.None))!;
        Assert.True(baseline.Accepted);
        Assert.Equal((1, latest.StartedAt), (baseline.RunCount, baseline.CoversFrom));

        var entry = Assert.Single(await new AuditStore(_scenario.Database).ListAsync(Pair, 10, CancellationToken.None));
        Assert.Equal((Environment.UserName, "cli", latest.Id, "gross is derived on purpose now"), (entry.Actor, entry.Via, entry.RunId!.Value, entry.Reason));
        Assert.Contains("accepted despite critical findings", entry.Detail, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Accept_AChosenRunWithoutFindings_NeedsNoForce_AndAnUnknownRunIsExitCode2()
    {
        var healthy = (await _scenario.History.GetRunsAsync(Pair, DashboardScenario.Cycles, includePoints: false, CancellationToken.None))
            .First(r => r.Status == RunStatus.Succeeded && r.Findings.Count == 0);

        var unknown = await CliRun.Of("baseline", "accept", Pair, "--run", "987654321", "--config", _config);
        Assert.Equal(2, unknown.ExitCode);
        Assert.Contains("has no run 987654321", unknown.Error, StringComparison.Ordinal);

        var run = await CliRun.Of("baseline", "accept", Pair, "--run", healthy.Id.ToString(CultureInfo.InvariantCulture), "--config", _config);
        Assert.Equal(0, run.ExitCode);
        Assert.Contains($"adopting run {healthy.Id} of ", run.Out, StringComparison.Ordinal);
        Assert.Contains("no findings", run.Out, StringComparison.Ordinal);
        var baseline = (await _scenario.History.GetBaselineAsync(Pair, CancellationToken.None))!;
        Assert.Equal(healthy.StartedAt, baseline.CoversFrom);
        // Oracle: the pooled profile of one run is that run's sample again; its r is the run's r as the store kept it.
        Assert.Equal(healthy.Profile!.PearsonR!.Value, baseline.Profile.PearsonR!.Value, 9);
    }

    [Fact]
    public async Task Reset_SaysTheNextBaselineComesFromTheNextRuns_AndTheStoredRunsAreNotPooledAgain()
    {
        var stored = await _scenario.History.CountRunsAsync(Pair, CancellationToken.None);

        var run = await CliRun.Of("baseline", "reset", Pair, "--reason", "table re-modelled", "--config", _config);

        Assert.Equal(0, run.ExitCode);
        Assert.Contains($"The next baseline is pooled (first_runs", run.Out, StringComparison.Ordinal);
        Assert.Contains($"from the runs started after the reset; the {stored} run(s) stored before it are not used", System.Text.RegularExpressions.Regex.Replace(run.Out, @"\s+", " "), StringComparison.Ordinal);
        Assert.Null(await _scenario.History.GetBaselineAsync(Pair, CancellationToken.None));

        // A check now finds sixteen stored runs and still no baseline: they came before the reset.
        var service = new BaselineService(_scenario.History, Profiler.Profile, resets: new BaselineResetStore(_scenario.Database));
        var pair = _scenario.Config.FindPair(Pair)! with { Baseline = new BaselinePolicy { Kind = BaselinePolicyKind.FirstRuns, FirstRuns = 3 } };
        Assert.Null(await service.GetOrBuildAsync(pair, DateTimeOffset.UtcNow.AddMinutes(1), CancellationToken.None));

        var show = await CliRun.Of("baseline", "show", Pair, "--config", _config);
        Assert.Contains("it was reset", show.Error + show.Out, StringComparison.Ordinal);
        var entry = Assert.Single(await new AuditStore(_scenario.Database).ListAsync(Pair, 10, CancellationToken.None));
        Assert.Equal(("table re-modelled", Environment.UserName), (entry.Reason, entry.Actor));
    }

    [Fact]
    public async Task AlertsAck_ThenAlertsLogJson_ListsTheEntry()
    {
        var alert = (await _scenario.Alerts.GetOpenAlertsAsync([Pair], CancellationToken.None)).Single();

        var ack = await CliRun.Of("alerts", "ack", alert.Id.ToString(CultureInfo.InvariantCulture), "--reason", "looking into it", "--config", _config);
        Assert.Equal(0, ack.ExitCode);
        var log = await CliRun.Of("alerts", "log", "--format", "json", "--config", _config);
        Assert.Equal(0, log.ExitCode);

        using var json = JsonDocument.Parse(log.Out);
        var entry = Assert.Single(json.RootElement.GetProperty("entries").EnumerateArray());
        Assert.Equal("ack", entry.GetProperty("action").GetString());
        Assert.Equal(alert.Id, entry.GetProperty("alert_id").GetInt64());
        Assert.Equal(Pair, entry.GetProperty("pair").GetString());
        Assert.Equal("looking into it", entry.GetProperty("reason").GetString());
        Assert.Equal(Environment.UserName, entry.GetProperty("actor").GetString());
        Assert.NotNull((await _scenario.Alerts.GetAlertAsync(alert.Id, CancellationToken.None))!.AckedAt);

        var table = await CliRun.Of("alerts", "log", Pair, "--config", _config);
        Assert.Contains("looking into it", table.Out, StringComparison.Ordinal);
    }
}
