using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Findings;
using static DriftWatch.IntegrationTests.Alerting.AlertHarness;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>An SMTP outage delays alerts and loses none: the outbox holds them, recovery delivers each once.</summary>
public sealed class OutboxOutageTests : IDisposable
{
    private readonly TemporarySqliteStore _file = new();

    [Fact]
    public async Task Dispatch_ServerDownWhileAlertsAreConfirmed_KeepsThemAndDeliversEachOnceOnRecovery()
    {
        var port = LoopbackSmtp.FreePort();
        var options = new OutboxOptions { RetryBase = TimeSpan.FromMinutes(1), RetryMax = TimeSpan.FromMinutes(10), Jitter = 0.5, Lease = TimeSpan.FromMinutes(5) };
        var harness = new AlertHarness(await _file.OpenAsync(), Smtp(port, MailingList("team", "team@example.org"), MailingList("owners", "owners@example.org")), options);

        // Three cycles confirm alerts of three different pairs while nothing listens on the port.
        for (var i = 0; i < 3; i++)
        {
            await harness.CycleAsync((Pair($"pair_{i}"), [Critical(FindingKind.BecamePerfect, $"pair {i} became exact")]));
            var down = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
            Assert.Equal(0, down.Sent);
            harness.Time.Advance(TimeSpan.FromMinutes(1));
        }

        var held = await harness.Outbox.ListOutboxAsync(unsentOnly: true, 100, CancellationToken.None);
        Assert.Equal(6, held.Count);
        Assert.All(held, e => Assert.Null(e.SentAt));
        // Tried ones carry the error; a mailing list's later messages in the same pass were deferred untried.
        Assert.Contains(held, e => e.Attempts >= 1 && e.LastError!.Contains("unavailable", StringComparison.Ordinal));

        using var server = LoopbackSmtp.Start(port);
        // Every retry is due within the cap (10 min) plus the lease (5 min).
        harness.Time.Advance(TimeSpan.FromMinutes(15));
        var recovered = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
        harness.Time.Advance(TimeSpan.FromHours(2));
        var again = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal(6, recovered.Sent);
        Assert.Equal(0, again.Sent + again.Failed);
        var received = await LoopbackSmtp.WaitForAsync(server, 6);
        Assert.Equal(6, received.Count);
        Assert.Equal(6, received.Select(m => m.MessageId).Distinct(StringComparer.Ordinal).Count());
        Assert.Equal(held.Select(e => e.MessageId).Order(StringComparer.Ordinal), received.Select(m => m.MessageId).Order(StringComparer.Ordinal));
        Assert.Empty(await harness.Outbox.ListOutboxAsync(unsentOnly: true, 100, CancellationToken.None));
    }

    [Fact]
    public async Task Dispatch_OneMailingListDown_OtherListsStillDeliver()
    {
        using var server = LoopbackSmtp.Start();
        var config = Smtp(LoopbackSmtp.Port(server), MailingList("team", "team@example.org")) with
        {
            MailingLists =
            [
                MailingList("team", "team@example.org"),
                // A file mailing list whose directory cannot be created: a file stands where the folder should be.
                new() { Name = "archive", Channel = DriftWatch.Core.Configuration.ChannelKind.File, Directory = Path.Combine(_file.DatabasePath, "not-a-folder") },
            ],
        };
        var harness = new AlertHarness(await _file.OpenAsync(), config);

        await harness.CycleAsync((Pair("weights"), [Critical(FindingKind.BecamePerfect, "exact")]));
        var result = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal((1, 1), (result.Sent, result.Failed));
        Assert.Single(await LoopbackSmtp.WaitForAsync(server, 1));
        var waiting = Assert.Single(await harness.Outbox.ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None));
        Assert.Equal("archive", waiting.MailingList);
        Assert.Contains("cannot write", waiting.LastError, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Dispatch_Failure_SchedulesTheRetryByBackoff()
    {
        var port = LoopbackSmtp.FreePort();
        var options = new OutboxOptions { RetryBase = TimeSpan.FromMinutes(2), RetryMax = TimeSpan.FromHours(1), Jitter = 0 };
        var harness = new AlertHarness(await _file.OpenAsync(), Smtp(port, MailingList("team", "team@example.org")), options);
        await harness.CycleAsync((Pair("weights"), [Critical(FindingKind.BecamePerfect, "exact")]));

        await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
        var first = Assert.Single(await harness.Outbox.ListOutboxAsync(true, 10, CancellationToken.None));
        harness.Time.Advance(TimeSpan.FromMinutes(1));
        var early = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
        harness.Time.Advance(TimeSpan.FromMinutes(1));
        await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
        var second = Assert.Single(await harness.Outbox.ListOutboxAsync(true, 10, CancellationToken.None));

        // Attempt 1 failed at T: retry at T + 2 min (no jitter); attempt 2 failed at T + 2 min: retry 4 min later.
        Assert.Equal(1, first.Attempts);
        Assert.Equal(Start + TimeSpan.FromMinutes(2), first.NextAttemptAt);
        Assert.Equal(0, early.Failed + early.Sent);
        Assert.Equal(2, second.Attempts);
        Assert.Equal(Start + TimeSpan.FromMinutes(2 + 4), second.NextAttemptAt);
    }

    public void Dispose() => _file.Dispose();
}
