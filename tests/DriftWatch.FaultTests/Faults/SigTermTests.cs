using DriftWatch.FaultTests.Infrastructure;
using DriftWatch.IntegrationTests.Infrastructure;

namespace DriftWatch.FaultTests.Faults;

/// <summary>SIGTERM (a supervisor's stop) while a check's query runs on the source server.</summary>
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
}
