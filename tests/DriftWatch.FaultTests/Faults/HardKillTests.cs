using DriftWatch.FaultTests.Infrastructure;
using DriftWatch.IntegrationTests.Infrastructure;

namespace DriftWatch.FaultTests.Faults;

/// <summary>SIGKILL while a check is in flight (a crash, an out-of-memory kill), then a restart on the same store.</summary>
[Collection(UsesPostgres.Name)]
public sealed class HardKillTests(PostgresServer server)
{
    [Fact]
    public async Task KillNineMidCheck_Restarted_NoMailTwice_AlertsConsistent_Serving()
    {
        await using var bench = await FaultBench.CreateAsync(server);
        await bench.SetPauseAsync(600);
        // "broken" reads a table that does not exist: its check_failing alert makes mail; "slow" holds a check in flight.
        bench.WriteConfig(new WorkerSetup
        {
            Pairs = [new PairSpec("broken", "no_such_table"), new PairSpec("slow", FaultBench.SlowView)],
            CheckFailingAfter = 2,
        });
        var first = await bench.StartWorkerAsync();
        await Eventually.TrueAsync("the check-failing mail sent and a slow check in flight", async _ =>
            (await bench.OutboxAsync()) is [_, ..] outbox && outbox.All(m => m.Sent) && await bench.SleepingQueriesAsync() > 0, first.OutputLog);
        var runsBefore = await bench.RunsAsync("broken");

        await first.KillHardAsync();
        // The killed worker's query sleeps on in the source server (nobody cancels it); end the pause so the next
        // worker's checks of "slow" finish.
        await bench.SetPauseAsync(0);

        using var second = await bench.StartWorkerAsync();
        await Eventually.TrueAsync("a run of slow recorded by the restarted worker", async _ => (await bench.RunsAsync("slow")).Any(r => r.Status == "succeeded"), second.OutputLog);
        var lastBefore = runsBefore[^1].Id;
        await Eventually.TrueAsync("new runs of broken after the restart", async _ => (await bench.RunsAsync("broken")).Any(r => r.Id > lastBefore), second.OutputLog);
        Assert.True(await bench.HealthyAsync());

        await second.TerminateAsync();
        Assert.Equal(0, await second.WaitForExitAsync(Eventually.Deadline));
        // Runs recorded before the kill are all still there.
        var runsAfter = await bench.RunsAsync("broken");
        Assert.All(runsBefore, r => Assert.Contains(r, runsAfter));
        // One open check-failing alert for broken, confirmed once: the restart did not start it over or tell anyone again.
        var alert = Assert.Single(await bench.CheckFailingAlertsAsync("broken"));
        Assert.True(alert.Confirmed);
        Assert.Equal("confirmed", alert.Status);
        await bench.AssertEveryMailOnceAsync();
    }
}
