using System.Globalization;
using System.Text.Json;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;
using DriftWatch.Dashboard;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;

namespace DriftWatch.IntegrationTests.Dashboard;

/// <summary>
/// The dashboard over a PostgreSQL store: the pages and the API read it, and the metrics' aggregate SQL (one
/// statement for both dialects) counts what was recorded. The OpenMetrics format is checked on SQLite in
/// DriftWatch.Tests; the same writer serves here, so these tests check the figures.
/// </summary>
[Collection(UsesPostgres.Name)]
public sealed class PostgresDashboardTests(PostgresServer server) : IAsyncLifetime
{
    private const string Pair = "payments.fee_vs_amount";
    private static readonly DateTimeOffset Start = new(2026, 11, 20, 0, 0, 0, TimeSpan.Zero);

    private PostgresDatabase _database = null!;

    public async Task InitializeAsync() => _database = await PostgresDatabase.CreateAsync(server);

    public async Task DisposeAsync() => await _database.DisposeAsync();

    [Fact]
    public async Task Dashboard_OnPostgres_ServesPagesApiAndCountsNewRunsInMetrics()
    {
        await using var store = new PostgresStoreDatabase(_database.ConnectionString);
        await new MigrationRunner(store).MigrateAsync(CancellationToken.None);
        var history = new HistoryStore(store);
        var alerts = new AlertStore(store);
        var config = new DriftWatchConfig
        {
            Sources = [new SourceConfig { Name = "ledger", Kind = SourceKind.Postgres, ConnectionString = "Host=127.0.0.1" }],
            Store = new StoreConfig { Kind = StoreKind.Postgres, ConnectionString = _database.ConnectionString },
            Pairs = [new PairConfig { Name = Pair, Source = "ledger", Table = "payments", X = "amount", Y = "fee" }],
        };

        // Anscombe's first data set (Anscombe 1973, Table 1): Pearson r = 0.816 to three decimals, as published.
        double[] x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
        double[] y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
        var sample = new PairedSample(x, y);
        var profile = Profiler.Profile(sample, Thresholds.Default);
        var runId = await history.RecordRunAsync(new NewRun(Pair, Start, Start.AddSeconds(2), RunStatus.Succeeded, null, profile, [], null, sample), CancellationToken.None);
        var alert = new AlertState(0, Pair, FindingKind.Outliers, Severity.Warning, AlertStatus.Watching, 1, Start, Start, null, null, null, null, "a point far off the line", runId);
        await alerts.ApplyCycleAsync(new CycleDecision(Start, [alert], []), [], null, CancellationToken.None);

        await using var dashboard = await DashboardServer.StartAsync(
            new DashboardServerOptions(config, store, history, alerts)
            {
                Listen = new System.Net.IPEndPoint(System.Net.IPAddress.Loopback, 0),
                WorkerHealth = WorkerHealth.From(() => true),
                Logging = b => b.SetMinimumLevel(LogLevel.Warning),
            },
            CancellationToken.None);
        using var client = new HttpClient { BaseAddress = dashboard.Address };

        var overview = await client.GetStringAsync(new Uri("/", UriKind.Relative));
        Assert.Contains(">0.816<", overview, StringComparison.Ordinal);

        using (var pairs = JsonDocument.Parse(await client.GetStringAsync(new Uri("/api/pairs", UriKind.Relative))))
        {
            var row = pairs.RootElement.GetProperty("pairs")[0];
            Assert.Equal("watching", row.GetProperty("status").GetString());
            Assert.Equal(0.816, row.GetProperty("latest_run").GetProperty("profile").GetProperty("pearson_r").GetDouble(), 3);
        }

        using var health = await client.GetAsync(new Uri("/healthz", UriKind.Relative));
        Assert.Equal(200, (int)health.StatusCode);

        var first = await client.GetStringAsync(new Uri("/metrics", UriKind.Relative));
        Assert.Equal(0, Sample(first, "driftwatch_runs_total{pair=\"" + Pair + "\",status=\"succeeded\"}"));
        Assert.Equal(1, Sample(first, "driftwatch_open_alerts{severity=\"warning\"}"));

        // After the first scrape: runs of 0.3 s and 7 s succeed, one of 90 s fails.
        await Record(history, Start.AddHours(1), TimeSpan.FromMilliseconds(300), RunStatus.Succeeded);
        await Record(history, Start.AddHours(2), TimeSpan.FromSeconds(7), RunStatus.Succeeded);
        await Record(history, Start.AddHours(3), TimeSpan.FromSeconds(90), RunStatus.Failed);

        var second = await client.GetStringAsync(new Uri("/metrics", UriKind.Relative));
        Assert.Equal(2, Sample(second, "driftwatch_runs_total{pair=\"" + Pair + "\",status=\"succeeded\"}"));
        Assert.Equal(1, Sample(second, "driftwatch_runs_total{pair=\"" + Pair + "\",status=\"failed\"}"));
        Assert.Equal(0, Sample(second, "driftwatch_check_duration_seconds_bucket{le=\"0.25\"}"));
        Assert.Equal(1, Sample(second, "driftwatch_check_duration_seconds_bucket{le=\"0.5\"}"));
        Assert.Equal(2, Sample(second, "driftwatch_check_duration_seconds_bucket{le=\"10.0\"}"));
        Assert.Equal(2, Sample(second, "driftwatch_check_duration_seconds_bucket{le=\"60.0\"}"));
        Assert.Equal(3, Sample(second, "driftwatch_check_duration_seconds_bucket{le=\"120.0\"}"));
        Assert.Equal(3, Sample(second, "driftwatch_check_duration_seconds_count"));
        Assert.Equal(97.3, Sample(second, "driftwatch_check_duration_seconds_sum"), 9);
    }

    private static Task<long> Record(HistoryStore history, DateTimeOffset started, TimeSpan took, RunStatus status) =>
        history.RecordRunAsync(new NewRun(Pair, started, started + took, status, status == RunStatus.Failed ? "timeout" : null, null, [], null, null), CancellationToken.None);

    private static double Sample(string exposition, string series)
    {
        var line = exposition.Split('\n').Single(l => l.StartsWith(series + " ", StringComparison.Ordinal));
        return double.Parse(line[(series.Length + 1)..], NumberStyles.Float, CultureInfo.InvariantCulture);
    }
}
