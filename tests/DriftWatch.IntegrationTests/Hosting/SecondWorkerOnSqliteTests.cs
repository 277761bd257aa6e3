using Dapper;
using DriftWatch.Store;
using Microsoft.Data.Sqlite;

namespace DriftWatch.IntegrationTests.Hosting;

/// <summary>
/// A SQLite store keeps one worker's in-memory schedule: when a second <c>driftwatch run</c> starts on the same
/// store, both see each other's heartbeat in worker_instances and say so, naming the other process; the runs of the
/// schedule record the slot they were for.
/// </summary>
public sealed class SecondWorkerOnSqliteTests : IDisposable
{
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "dw-second-" + Guid.NewGuid().ToString("N"));

    public SecondWorkerOnSqliteTests() => Directory.CreateDirectory(_folder);

    [Fact]
    public async Task Run_SecondWorkerOnTheSameSqliteStore_BothSayAnotherWorkerRuns_RunsRecordTheirSlot()
    {
        WorkerProcess.CreateSource(Path.Combine(_folder, "lab.db"));
        var first = Config("first");
        var second = Config("second");

        using var one = WorkerProcess.Start(first);
        await one.WaitForLineAsync("Store schema is up to date");
        using var two = WorkerProcess.Start(second);
        await two.WaitForLineAsync("Another worker runs on this store (first:");
        await one.WaitForLineAsync("Another worker runs on this store (second:");
        Assert.Contains(two.Lines, l => l.Contains("a SQLite store serves one worker", StringComparison.Ordinal));
        // Stopped once both run their schedules (a SIGTERM while the host is still starting is another matter).
        await two.WaitForLineAsync("Check of tidy started");
        var secondExit = await two.StopAsync();
        Assert.True(secondExit == 0, $"the second worker exited {secondExit}:\n{two.Output}");
        var firstExit = await one.StopAsync();
        Assert.True(firstExit == 0, $"the first worker exited {firstExit}:\n{one.Output}");

        var store = new SqliteStoreDatabase($"Data Source={Path.Combine(_folder, "store.db")}");
        await using var connection = await store.OpenAsync(CancellationToken.None);
        var slots = (await connection.QueryAsync<long?>("SELECT slot_at_ms FROM runs WHERE pair = 'tidy'")).ToList();
        Assert.NotEmpty(slots);
        // The schedule fires on whole seconds (cron "* * * * * ?"): each run's slot is one of them.
        Assert.All(slots, s => Assert.Equal(0, s!.Value % 1000));
        // A clean stop removes the worker's heartbeat row.
        Assert.Equal(0, await connection.ExecuteScalarAsync<long>("SELECT count(*) FROM worker_instances"));
    }

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        Directory.Delete(_folder, recursive: true);
    }

    /// <summary>One file per worker (its own id and spool), both on the same store.</summary>
    private string Config(string id)
    {
        var path = Path.Combine(_folder, id + ".yaml");
        File.WriteAllText(path, $"""
            sources:
              - name: lab
                kind: sqlite
                connection: lab.db
            store:
              kind: sqlite
              connection: store.db
            pairs:
              - name: tidy
                source: lab
                table: t
                x: a
                y: b
                schedule: "* * * * * ?"
            dashboard:
              enabled: false
            logging:
              level: debug
            worker:
              id: {id}
              stop_grace: 1s
              heartbeat: 1s
              takeover_after: 3s
              spool:
                path: spool-{id}
            """);
        return path;
    }
}
