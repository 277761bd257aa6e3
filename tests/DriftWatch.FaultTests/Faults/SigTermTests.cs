using DriftWatch.FaultTests.Infrastructure;
using DriftWatch.IntegrationTests.Infrastructure;
using Npgsql;

namespace DriftWatch.FaultTests.Faults;

/// <summary>SIGTERM (a supervisor's stop) while a check's query runs on the source server, and while the worker starts.</summary>
[Collection(UsesPostgres.Name)]
public sealed class SigTermTests(PostgresServer server)
{
    [Fact]
    public async Task SigTermMidCheck_ExitsZero_RunRecordedCancelled_QueryCancelledOnTheServer()
    {
        await using var bench = await FaultBench.CreateAsync(server);
        // Ten minutes of pg_sleep: only a cancel can end the query within the test.
        await bench.SetPauseAsync(600);
        bench.WriteConfig(new WorkerSetup { Pairs = [new PairSpec("slow", FaultBench.SlowView)], StopGrace = "1s" });
        using var worker = await bench.StartWorkerAsync();
        await Eventually.TrueAsync("the check's query running on the source server", async _ => await bench.SleepingQueriesAsync() > 0, worker.OutputLog);

        await worker.TerminateAsync();

        Assert.True(await worker.WaitForExitAsync(Eventually.Deadline) == 0, worker.OutputLog());
        var run = Assert.Single(await bench.RunsAsync("slow"));
        Assert.Equal("failed", run.Status);
        Assert.Equal("check cancelled before it finished (shutdown)", run.Error);
        // The cancel reached PostgreSQL: no session of the source database is still sleeping in the view. A query
        // left behind would sleep on for ten minutes, far past this wait.
        await Eventually.TrueAsync("no query of the check left on the source server", async _ => await bench.SleepingQueriesAsync() == 0);
    }

    /// <summary>
    /// A supervisor stopping the service while it starts (a restart loop, a deploy): the start is held at a known
    /// point, the store's migration lock, which this test holds, so the signal lands mid-start every time. Before
    /// the fix the host's cancelled start escaped as an unhandled exception (exit 134, a stack trace in the log).
    /// </summary>
    [Fact]
    public async Task SigTermWhileStarting_ExitsZero_WithoutAnUnhandledException()
    {
        await using var bench = await FaultBench.CreateAsync(server);
        bench.WriteConfig(new WorkerSetup { Pairs = [new PairSpec("fuel", FaultBench.SourceTable)] });
        await using var holder = new NpgsqlConnection(bench.Store.ConnectionString);
        await holder.OpenAsync();
        await using (var take = new NpgsqlCommand($"SELECT pg_advisory_lock({MigrationLockKey})", holder))
        {
            await take.ExecuteNonQueryAsync();
        }

        using var worker = bench.StartProcess();
        await Eventually.TrueAsync("the worker's start waiting for the migration lock", async ct =>
        {
            Assert.False(worker.HasExited, worker.OutputLog());
            await using var connection = new NpgsqlConnection(bench.Store.ConnectionString);
            await connection.OpenAsync(ct);
            await using var waiting = new NpgsqlCommand("SELECT count(*) FROM pg_locks WHERE locktype = 'advisory' AND NOT granted", connection);
            return (long)(await waiting.ExecuteScalarAsync(ct))! > 0;
        }, worker.OutputLog);

        await worker.TerminateAsync();

        Assert.True(await worker.WaitForExitAsync(Eventually.Deadline) == 0, worker.OutputLog());
        Assert.DoesNotContain(worker.Output, line => line.Contains("Unhandled exception", StringComparison.OrdinalIgnoreCase));
        // The start stopped where it was held: the store was never migrated, so nothing was scheduled or checked.
        await using var probe = new NpgsqlCommand("SELECT to_regclass('public.runs') IS NULL", holder);
        Assert.True((bool)(await probe.ExecuteScalarAsync())!, worker.OutputLog());
    }

    // The store's schema-migration lock (MigrationRunner's advisory lock key), written out: a test of the lock
    // should break if the key changes unnoticed.
    private const long MigrationLockKey = 0x44_72_69_66_74_57_01;
}
