using DriftWatch.FaultTests.Infrastructure;
using DriftWatch.IntegrationTests.Infrastructure;

namespace DriftWatch.FaultTests.Faults;

/// <summary>The SMTP server is down when an alert is confirmed, then comes back on the same port.</summary>
[Collection(UsesPostgres.Name)]
public sealed class SmtpOutageTests(PostgresServer server)
{
    [Fact]
    public async Task SmtpStoppedThenRestarted_EachMailDeliveredOnceAfterRecovery_FailureLoggedInOneLine()
    {
        await using var bench = await FaultBench.CreateAsync(server);
        bench.WriteConfig(new WorkerSetup { Pairs = [new PairSpec("km-vs-litres", FaultBench.SourceTable)], CheckFailingAfter = 1 });
        using var worker = await bench.StartWorkerAsync();

        await bench.Smtp.StopAsync();
        await bench.StopSourceAsync();
        await Eventually.TrueAsync("an alert message whose first attempt failed", async _ =>
            (await bench.OutboxAsync()).Any(m => !m.Sent && m.Attempts >= 1), worker.OutputLog);
        var waiting = (await bench.OutboxAsync()).First(m => !m.Sent);
        Assert.Contains("unavailable", waiting.LastError, StringComparison.Ordinal);
        // One line per failed attempt, naming the message; no stack trace at the default level.
        var lines = worker.Output.Where(l => l.Contains(waiting.MessageId, StringComparison.Ordinal) && l.Contains("failed (attempt 1)", StringComparison.Ordinal)).ToList();
        Assert.Single(lines);
        Assert.DoesNotContain(worker.Output, l => l.TrimStart().StartsWith("at DriftWatch.", StringComparison.Ordinal));
        Assert.True(await bench.HealthyAsync(), "/healthz while SMTP is down");

        await bench.Smtp.StartAgainAsync();
        await bench.StartSourceAsync();
        // The waiting message goes out on its retry; the cleared notice after it.
        await Eventually.TrueAsync("the waiting message delivered", _ => Task.FromResult(bench.Smtp.ReceivedIds.Contains(waiting.MessageId)), worker.OutputLog);
        await Eventually.TrueAsync("the check-failing alert cleared", async _ => (await bench.CheckFailingAlertsAsync("km-vs-litres")) is [.., { Status: "cleared" }], worker.OutputLog);
        await bench.WaitAllSentAsync(2, worker.OutputLog);
        Assert.True(await bench.HealthyAsync());

        await worker.TerminateAsync();
        Assert.Equal(0, await worker.WaitForExitAsync(Eventually.Deadline));
        await bench.AssertEveryMailOnceAsync();
        Assert.Single(bench.Smtp.ReceivedIds, id => id == waiting.MessageId);
    }
}
