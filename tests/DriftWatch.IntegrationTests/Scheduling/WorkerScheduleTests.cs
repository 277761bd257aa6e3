using DriftWatch.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Hosting;
using DriftWatch.IntegrationTests.Alerting;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Store;
using Microsoft.Extensions.DependencyInjection;

namespace DriftWatch.IntegrationTests.Scheduling;

/// <summary>The real worker host (Quartz, store, PostgreSQL source) checking a pair every second.</summary>
[Collection(UsesPostgres.Name)]
public sealed class WorkerScheduleTests(PostgresServer server) : IDisposable
{
    private readonly TemporarySqliteStore _store = new();

    [Fact]
    public async Task EverySecondSchedule_WithSlowerChecks_RunsRepeatedlyWithoutOverlap()
    {
        await using var db = await PostgresDatabase.CreateAsync(server);
        await db.ExecuteAsync("""
            CREATE TABLE loads (km double precision, litres double precision);
            INSERT INTO loads SELECT g, g * 0.3 + (g % 7) FROM generate_series(1, 500) g;
            """);
        // Each check takes 1.5 s (pg_sleep inside the read-only query) while the cron fires every second:
        // without the no-overlap rule two runs of the pair would run at once.
        var yaml = $$"""
            sources:
              - name: depot
                kind: postgres
                connection: ${SOURCE_PG}
            store:
              kind: sqlite
              connection: {{_store.DatabasePath}}
            pairs:
              - name: km-vs-litres
                source: depot
                query: SELECT km, litres FROM loads CROSS JOIN (SELECT pg_sleep(1.5)) AS pause
                x: km
                y: litres
                schedule: "* * * * * ?"
            dashboard:
              enabled: false
            """;
        var loaded = ConfigLoader.Parse(yaml, "worker.yaml", name => name == "SOURCE_PG" ? db.ConnectionString : null, _store.Folder);
        Assert.True(loaded.Ok, string.Join("\n", loaded.Errors));

        await using var app = WorkerHost.Build(loaded.Config!, new WorkerHostOptions { DashboardEndPoint = new System.Net.IPEndPoint(System.Net.IPAddress.Loopback, 0) });
        await app.StartAsync();
        var history = app.Services.GetRequiredService<IHistoryStore>();
        for (var i = 0; i < 200 && await history.CountRunsAsync("km-vs-litres", CancellationToken.None) < 3; i++)
        {
            await Task.Delay(100);
        }

        await app.StopAsync();

        var runs = (await history.GetRunsAsync("km-vs-litres", 100, includePoints: false, CancellationToken.None))
            .OrderBy(r => r.StartedAt).ToList();
        Assert.True(runs.Count >= 3, $"expected at least 3 scheduled runs, got {runs.Count}");
        Assert.All(runs, r => Assert.Equal(RunStatus.Succeeded, r.Status));
        for (var i = 1; i < runs.Count; i++)
        {
            Assert.True(runs[i].StartedAt >= runs[i - 1].FinishedAt, $"run {i} started {runs[i].StartedAt:o} before run {i - 1} finished {runs[i - 1].FinishedAt:o}");
        }
    }

    [Fact]
    public async Task TwoPairsOfOneQuery_EverySecond_WithSlowerSharedReads_NeverCheckAPairTwiceAtOnce()
    {
        await using var db = await PostgresDatabase.CreateAsync(server);
        await db.ExecuteAsync("""
            CREATE TABLE loads (km double precision, litres double precision);
            INSERT INTO loads SELECT g, g * 0.3 + (g % 7) FROM generate_series(1, 500) g;
            """);
        // Both pairs read the same query, so one job checks both with one shared read that takes 1.5 s, while the
        // cron fires every second: the other pair's job for the next slot would check both again at once if a pair
        // being checked by another pair's job were not waited for (Quartz's no-overlap rule is per job).
        var yaml = $$"""
            sources:
              - name: depot
                kind: postgres
                connection: ${SOURCE_PG}
            store:
              kind: sqlite
              connection: {{_store.DatabasePath}}
            pairs:
              - name: km-vs-litres
                source: depot
                query: SELECT km, litres FROM loads CROSS JOIN (SELECT pg_sleep(1.5)) AS pause
                x: km
                y: litres
                schedule: "* * * * * ?"
              - name: litres-vs-km
                source: depot
                query: SELECT km, litres FROM loads CROSS JOIN (SELECT pg_sleep(1.5)) AS pause
                x: litres
                y: km
                schedule: "* * * * * ?"
            dashboard:
              enabled: false
            """;
        var loaded = ConfigLoader.Parse(yaml, "worker.yaml", name => name == "SOURCE_PG" ? db.ConnectionString : null, _store.Folder);
        Assert.True(loaded.Ok, string.Join("\n", loaded.Errors));

        await using var app = WorkerHost.Build(loaded.Config!, new WorkerHostOptions { DashboardEndPoint = new System.Net.IPEndPoint(System.Net.IPAddress.Loopback, 0) });
        await app.StartAsync();
        var history = app.Services.GetRequiredService<IHistoryStore>();
        for (var i = 0; i < 300 && (await history.CountRunsAsync("km-vs-litres", CancellationToken.None) < 3 || await history.CountRunsAsync("litres-vs-km", CancellationToken.None) < 3); i++)
        {
            await Task.Delay(100);
        }

        await app.StopAsync();

        foreach (var pair in new[] { "km-vs-litres", "litres-vs-km" })
        {
            var runs = (await history.GetRunsAsync(pair, 100, includePoints: false, CancellationToken.None)).OrderBy(r => r.StartedAt).ToList();
            Assert.True(runs.Count >= 3, $"expected at least 3 scheduled runs of {pair}, got {runs.Count}");
            Assert.All(runs, r => Assert.Equal(RunStatus.Succeeded, r.Status));
            for (var i = 1; i < runs.Count; i++)
            {
                Assert.True(runs[i].StartedAt >= runs[i - 1].FinishedAt, $"{pair}: run {i} started {runs[i].StartedAt:o} before run {i - 1} finished {runs[i - 1].FinishedAt:o}");
            }
        }
    }

    public void Dispose() => _store.Dispose();
}
