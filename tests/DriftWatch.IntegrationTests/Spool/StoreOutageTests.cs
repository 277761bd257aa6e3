using DriftWatch.Configuration;
using DriftWatch.Hosting;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Spool;
using DriftWatch.Store;
using Microsoft.Extensions.DependencyInjection;
using Npgsql;

namespace DriftWatch.IntegrationTests.Spool;

/// <summary>
/// The real worker host with a PostgreSQL store that goes away mid-run (a TCP relay in front of the real server is
/// cut, as a stopped server would be) and comes back: runs finished meanwhile wait in the spool, then reach the store
/// once each, in order, and alert evaluation reads every one of them (its watermark passes the last run).
/// </summary>
[Collection(UsesPostgres.Name)]
public sealed class StoreOutageTests(PostgresServer server) : IDisposable
{
    /// <summary>A bound against a hung test, not a timing assertion.</summary>
    private static readonly TimeSpan Deadline = TimeSpan.FromSeconds(90);

    private readonly string _folder = Path.Combine(Path.GetTempPath(), "dw-outage-" + Guid.NewGuid().ToString("N"));

    [Fact]
    public async Task StoreDownMidRun_RunsAreSpooled_ThenWrittenOnceInOrderAndEvaluated()
    {
        Directory.CreateDirectory(_folder);
        await using var source = await PostgresDatabase.CreateAsync(server);
        await using var storeDb = await PostgresDatabase.CreateAsync(server);
        // Anscombe's quartet, set I (Anscombe 1973; values from memory): any valid pair will do.
        await source.ExecuteAsync("""
            CREATE TABLE t (a double precision, b double precision);
            INSERT INTO t VALUES (10, 8.04), (8, 6.95), (13, 7.58), (9, 8.81), (11, 8.33), (14, 9.96),
                                 (6, 7.24), (4, 4.26), (12, 10.84), (7, 4.82), (5, 5.68);
            """);
        var target = new NpgsqlConnectionStringBuilder(storeDb.ConnectionString);
        await using var relay = new TcpRelay(target.Host!, target.Port);
        var viaRelay = new NpgsqlConnectionStringBuilder(storeDb.ConnectionString) { Host = "127.0.0.1", Port = relay.Port, Timeout = 3, CommandTimeout = 5 }.ToString();
        var yaml = """
            sources:
              - name: lab
                kind: postgres
                connection: ${SOURCE_PG}
            store:
              kind: postgres
              connection: ${STORE_PG}
            pairs:
              - name: anscombe
                source: lab
                table: t
                x: a
                y: b
                schedule: "* * * * * ?"
            dashboard:
              enabled: false
            """;
        var loaded = ConfigLoader.Parse(yaml, "worker.yaml", name => name switch { "SOURCE_PG" => source.ConnectionString, "STORE_PG" => viaRelay, _ => null }, _folder);
        Assert.True(loaded.Ok, string.Join("\n", loaded.Errors));

        await using var app = WorkerHost.Build(loaded.Config!, new WorkerHostOptions
        {
            DashboardEndPoint = new System.Net.IPEndPoint(System.Net.IPAddress.Loopback, 0),
            AlertEvery = TimeSpan.FromSeconds(1),
        });
        await app.StartAsync();
        var spool = app.Services.GetRequiredService<RunSpool>();
        try
        {
            await UntilAsync(async () => await StoredRunsAsync(storeDb) >= 1, "a first run in the store");

            relay.Cut();
            await UntilAsync(() => Task.FromResult(spool.Count >= 2), "two runs in the spool while the store is away");
            Assert.True(Directory.GetFiles(Path.Combine(_folder, "driftwatch-spool", "runs"), "*.json").Length >= 2);

            relay.Restore();
            await UntilAsync(async () => spool.Count == 0 && await StoredRunsAsync(storeDb) >= 3, "the spool written to the store");
            var feed = app.Services.GetRequiredService<RunFeed>();
            await UntilAsync(
                async () => await feed.GetWatermarkAsync(RunFeed.AlertsWatermarkKey, CancellationToken.None) >= await storeDb.ScalarAsync<long>("SELECT max(id) FROM runs"),
                "alert evaluation past the last run");
        }
        finally
        {
            relay.Restore();
            await app.StopAsync();
        }

        // Once each: as many rows as distinct keys (every worker run has one), and no start time twice.
        Assert.Equal(await StoredRunsAsync(storeDb), await storeDb.ScalarAsync<long>("SELECT count(DISTINCT run_key) FROM runs"));
        Assert.Equal(await StoredRunsAsync(storeDb), await storeDb.ScalarAsync<long>("SELECT count(DISTINCT started_at_ms) FROM runs"));
        // In order: store ids follow the start times, spooled runs included.
        Assert.Equal(0L, await storeDb.ScalarAsync<long>(
            "SELECT count(*) FROM runs r1 JOIN runs r2 ON r1.id < r2.id AND r1.started_at_ms > r2.started_at_ms"));
        // A run spooled while the store was away names the store's failure (the check needed the store for its baseline).
        Assert.True(await storeDb.ScalarAsync<long>("SELECT count(*) FROM runs WHERE status = 'failed'") >= 1);
    }

    public void Dispose()
    {
        if (Directory.Exists(_folder))
        {
            Directory.Delete(_folder, recursive: true);
        }
    }

    private static Task<long> StoredRunsAsync(PostgresDatabase storeDb) => storeDb.ScalarAsync<long>("SELECT count(*) FROM runs");

    private static async Task UntilAsync(Func<Task<bool>> condition, string what)
    {
        using var deadline = new CancellationTokenSource(Deadline);
        while (!await condition())
        {
            Assert.False(deadline.IsCancellationRequested, $"gave up waiting for {what}");
            await Task.Delay(100);
        }
    }
}
