using DriftWatch.Core.History;
using DriftWatch.Spool;
using DriftWatch.Store;
using Microsoft.Data.Sqlite;

namespace DriftWatch.IntegrationTests.Hosting;

/// <summary>
/// A worker killed (SIGKILL) while a check runs: the check's start marker survives it, and the next start records the
/// check as an interrupted run naming when it started.
/// </summary>
public sealed class InterruptedCheckTests : IDisposable
{
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "dw-interrupted-" + Guid.NewGuid().ToString("N"));

    public InterruptedCheckTests() => Directory.CreateDirectory(_folder);

    [Fact]
    public async Task Run_KilledDuringACheck_NextStartRecordsItAsInterrupted()
    {
        WorkerProcess.CreateSource(Path.Combine(_folder, "lab.db"));
        var config = Path.Combine(_folder, "driftwatch.yaml");
        // The query counts to 400 million in a recursive CTE before it returns: only the kill ends the first check.
        File.WriteAllText(config, """
            sources:
              - name: lab
                kind: sqlite
                connection: lab.db
                statement_timeout: 10m
            store:
              kind: sqlite
              connection: store.db
            pairs:
              - name: slow
                source: lab
                query: "WITH RECURSIVE n(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM n WHERE i < 400000000) SELECT a, b FROM t CROSS JOIN (SELECT max(i) AS m FROM n) AS pause"
                x: a
                y: b
                schedule: "* * * * * ?"
            dashboard:
              enabled: false
            logging:
              level: debug
            worker:
              stop_grace: 1s
            """);

        CheckMarker marker;
        using (var first = WorkerProcess.Start(config))
        {
            await first.WaitForLineAsync("Check of slow started");
            // The log line comes just before the checker leaves its marker: wait for the file itself.
            var started = Path.Combine(_folder, "driftwatch-spool", "started");
            using var deadline = new CancellationTokenSource(WorkerProcess.Deadline);
            while (!Directory.Exists(started) || Directory.GetFiles(started, "*.json").Length == 0)
            {
                Assert.False(deadline.IsCancellationRequested, "no start marker appeared; output:\n" + first.Output);
                await Task.Delay(50);
            }

            var file = Assert.Single(Directory.GetFiles(started, "*.json"));
            marker = SpoolFileFormat.DecodeMarker(File.ReadAllBytes(file));
            first.Kill();
        }

        Assert.Empty(await RunsAsync());
        using (var second = WorkerProcess.Start(config))
        {
            await second.WaitForLineAsync("is recorded as interrupted");
            await second.WaitForLineAsync("Check of slow started");
            Assert.Equal(0, await second.StopAsync());
        }

        var runs = await RunsAsync();
        var interrupted = Assert.Single(runs, r => r.Status == RunStatus.Interrupted);
        Assert.Equal(marker.StartedAt.ToUnixTimeMilliseconds(), interrupted.StartedAt.ToUnixTimeMilliseconds());
        Assert.Contains($"the check started at {marker.StartedAt.UtcDateTime:yyyy-MM-dd HH:mm:ss}Z was cut off", interrupted.Error, StringComparison.Ordinal);
        // The second worker's own check was stopped by SIGTERM: recorded as cancelled, as before; no marker is left.
        var cancelled = Assert.Single(runs, r => r.Status == RunStatus.Failed);
        Assert.Equal("check cancelled before it finished (shutdown)", cancelled.Error);
        Assert.Empty(Directory.GetFiles(Path.Combine(_folder, "driftwatch-spool", "started")));
    }

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        Directory.Delete(_folder, recursive: true);
    }

    private async Task<IReadOnlyList<RunRecord>> RunsAsync()
    {
        var path = Path.Combine(_folder, "store.db");
        if (!File.Exists(path))
        {
            return [];
        }

        var store = StoreFactory.CreateHistoryStore(new SqliteStoreDatabase($"Data Source={path}"), new DriftWatch.Core.Configuration.StoreConfig());
        return await store.GetRunsAsync("slow", 10, includePoints: false, CancellationToken.None);
    }
}
