using DriftWatch.FaultTests.Infrastructure;
using DriftWatch.IntegrationTests.Infrastructure;

namespace DriftWatch.FaultTests.Faults;

/// <summary>The source database stops taking connections, then comes back, under a running worker process.</summary>
[Collection(UsesPostgres.Name)]
public sealed class SourceOutageTests(PostgresServer server)
{
    [Fact]
    public async Task SourceStopped_RecordsFailedRuns_ConfirmsAndClearsCheckFailing_EachMailOnce_Recovers()
    {
        await using var bench = await FaultBench.CreateAsync(server);
        bench.WriteConfig(new WorkerSetup { Pairs = [new PairSpec("km-vs-litres", FaultBench.SourceTable)], CheckFailingAfter = 2 });
        using var worker = await bench.StartWorkerAsync();
        await Eventually.TrueAsync("a succeeded run", async _ => (await bench.RunsAsync("km-vs-litres")).Any(r => r.Status == "succeeded"), worker.OutputLog);

        await bench.StopSourceAsync();
        await Eventually.TrueAsync("a confirmed check-failing alert and its mail", async _ =>
            (await bench.CheckFailingAlertsAsync("km-vs-litres")).Any(a => a.Confirmed) && bench.Smtp.ReceivedIds.Count >= 1, worker.OutputLog);
        var failedWhileDown = (await bench.RunsAsync("km-vs-litres")).Where(r => r.Status == "failed").ToList();
        Assert.True(failedWhileDown.Count >= 2, "check_failing_after: 2 needs two failed runs in a row");
        // The reason is recorded with each run: a session cut off by the stop (SQLSTATE 57P01) or, after it, the
        // server's refusal (SQLSTATE 55000, "database … is not currently accepting connections"; PostgreSQL's own wording).
        Assert.All(failedWhileDown, r => Assert.StartsWith("Pair 'km-vs-litres' (source 'depot'", r.Error, StringComparison.Ordinal));
        Assert.Contains("not currently accepting connections", failedWhileDown[^1].Error, StringComparison.Ordinal);
        Assert.True(await bench.HealthyAsync(), "/healthz while the source is down (the worker itself is fine)");

        await bench.StartSourceAsync();
        var lastFailed = failedWhileDown[^1].Id;
        await Eventually.TrueAsync("a succeeded run after the source came back and the alert cleared", async _ =>
            (await bench.RunsAsync("km-vs-litres")).Any(r => r.Id > lastFailed && r.Status == "succeeded")
            && (await bench.CheckFailingAlertsAsync("km-vs-litres")) is [.., { Status: "cleared" }], worker.OutputLog);
        // The cleared notice is a message of its own, sent once.
        await bench.WaitAllSentAsync(2, worker.OutputLog);
        Assert.True(await bench.HealthyAsync());

        await worker.TerminateAsync();
        Assert.Equal(0, await worker.WaitForExitAsync(Eventually.Deadline));
        var alert = Assert.Single(await bench.CheckFailingAlertsAsync("km-vs-litres"));
        Assert.Equal("cleared", alert.Status);
        await bench.AssertEveryMailOnceAsync();
        // No run lost: every run is recorded as succeeded or failed, none left without an outcome.
        Assert.All(await bench.RunsAsync("km-vs-litres"), r => Assert.Contains(r.Status, (string[])["succeeded", "failed", "unmeasurable"]));
    }
}
