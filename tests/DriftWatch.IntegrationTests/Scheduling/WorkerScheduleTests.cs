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

    // Each check takes 1.5 s (pg_sleep inside the read-only query) while the cron fires every second.
    private const string SlowQuery = "SELECT km, litres FROM loads CROSS JOIN (SELECT pg_sleep(1.5)) AS pause";

    [Fact]
    public async Task EverySecondSchedule_WithSlowerChecks_RunsRepeatedlyWithoutOverlap()
    {
        // Without the no-overlap rule two runs of the pair would run at once.
        var runs = await RunWorkerAsync(("km-vs-litres", "km", "litres"));
        AssertRepeatedWithoutOverlap(runs["km-vs-litres"], "km-vs-litres");
    }

    [Fact]
    public async Task TwoPairsOfOneQuery_EverySecond_WithSlowerSharedReads_NeverCheckAPairTwiceAtOnce()
    {
        // Both pairs read the same query, so one job checks both with one shared read, while the cron fires every
        // second: the other pair's job for the next slot would check both again at once if a pair being checked by
        // another pair's job were not waited for (Quartz's no-overlap rule is per job).
        var runs = await RunWorkerAsync(("km-vs-litres", "km", "litres"), ("litres-vs-km", "litres", "km"));
        AssertRepeatedWithoutOverlap(runs["km-vs-litres"], "km-vs-litres");
        AssertRepeatedWithoutOverlap(runs["litres-vs-km"], "litres-vs-km");
    }

    private static void AssertRepeatedWithoutOverlap(IReadOnlyList<RunRecord> runs, string pair)
    {
        Assert.True(runs.Count >= 3, $"expected at least 3 scheduled runs of {pair}, got {runs.Count}");
        Assert.All(runs, r => Assert.Equal(RunStatus.Succeeded, r.Status));
        for (var i = 1; i < runs.Count; i++)
        {
            Assert.True(runs[i].StartedAt >= runs[i - 1].FinishedAt, $"{pair}: run {i} started {runs[i].StartedAt:o} before run {i - 1} finished {runs[i - 1].FinishedAt:o}");
        }
    }

    /// <summary>Runs the worker host on the slow query, every pair every second, until each has three runs; their runs by start.</summary>
    private async Task<Dictionary<string, IReadOnlyList<RunRecord>>> RunWorkerAsync(params (string Name, string X, string Y)[] pairs)
    {
        await using var db = await PostgresDatabase.CreateAsync(server);
        await db.ExecuteAsync("""
            CREATE TABLE loads (km double precision, litres double precision);
            INSERT INTO loads SELECT g, g * 0.3 + (g % 7) FROM generate_series(1, 500) g;
            """);
        var pairYaml = string.Concat(pairs.Select(p => $$"""

              - name: {{p.Name}}
                source: depot
                query: {{SlowQuery}}
                x: {{p.X}}
                y: {{p.Y}}
                schedule: "* * * * * ?"
            """));
        var yaml = $$"""
            sources:
              - name: depot
                kind: postgres
                connection: ${SOURCE_PG}
            store:
              kind: sqlite
              connection: {{_store.DatabasePath}}
            dashboard:
              enabled: false
            pairs:{{pairYaml}}
            """;
        var loaded = ConfigLoader.Parse(yaml, "worker.yaml", name => name == "SOURCE_PG" ? db.ConnectionString : null, _store.Folder);
        Assert.True(loaded.Ok, string.Join("\n", loaded.Errors));

        await using var app = WorkerHost.Build(loaded.Config!, new WorkerHostOptions { DashboardEndPoint = new System.Net.IPEndPoint(System.Net.IPAddress.Loopback, 0) });
        await app.StartAsync();
        var history = app.Services.GetRequiredService<IHistoryStore>();
        for (var i = 0; i < 300; i++)
        {
            var counts = await Task.WhenAll(pairs.Select(p => history.CountRunsAsync(p.Name, CancellationToken.None)));
            if (counts.All(c => c >= 3))
            {
                break;
            }

            await Task.Delay(100);
        }

        await app.StopAsync();
        var runs = new Dictionary<string, IReadOnlyList<RunRecord>>(StringComparer.Ordinal);
        foreach (var pair in pairs)
        {
            runs[pair.Name] = [.. (await history.GetRunsAsync(pair.Name, 100, includePoints: false, CancellationToken.None)).OrderBy(r => r.StartedAt)];
        }

        return runs;
    }

    public void Dispose() => _store.Dispose();
}
