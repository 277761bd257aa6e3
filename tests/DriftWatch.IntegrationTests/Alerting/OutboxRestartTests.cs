using DriftWatch.Alerting.Channels;
using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using Microsoft.Extensions.Logging.Abstractions;
using static DriftWatch.IntegrationTests.Alerting.AlertHarness;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>
/// A worker killed with a message claimed does not hold that mail back for a lease: restarted under the same name it
/// takes its claims back at once. Leases are short because they are renewed while a message is in hand.
/// </summary>
public sealed class OutboxRestartTests : IDisposable
{
    private static readonly OutboxOptions WorkerA = new() { ClaimOwner = "worker-a" };

    private readonly TemporarySqliteStore _file = new();

    [Fact]
    public async Task Restart_AfterAKillWithAMessageClaimed_SendsItAtOnceOverSmtp()
    {
        using var server = LoopbackSmtp.Start();
        var config = Smtp(LoopbackSmtp.Port(server), MailingList("team", "team@example.org"));
        var killed = new AlertHarness(await _file.OpenAsync(), config, WorkerA);
        var queued = Assert.Single((await killed.CycleAsync((Pair("weights"), [Critical(FindingKind.BecamePerfect, "weighed_kg became an exact copy of declared_kg")]))).Queued);
        // The dispatcher claimed the message and the process died before sending it.
        Assert.Single(await killed.Outbox.ClaimDueAsync(killed.Time.GetUtcNow(), WorkerA.Lease, WorkerA.ClaimOwner, 10, CancellationToken.None));

        // Restarted a moment later (the clock has not moved): the lease alone would hold the mail back.
        var restarted = new AlertHarness(await _file.OpenAsync(), config, WorkerA);
        var held = await restarted.Dispatcher.DispatchDueAsync(CancellationToken.None);
        var takenBack = await restarted.Dispatcher.TakeBackOwnClaimsAsync(CancellationToken.None);
        var sent = await restarted.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal(0, held.Sent + held.Failed);
        Assert.Equal(1, takenBack);
        Assert.Equal(1, sent.Sent);
        var received = Assert.Single(await LoopbackSmtp.WaitForAsync(server, 1));
        Assert.Equal(queued.MessageId, received.MessageId);
        Assert.Empty(await restarted.Outbox.ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None));
    }

    [Fact]
    public async Task Restart_OfAnotherWorker_LeavesTheClaimToItsLease()
    {
        var config = new AlertingConfig { MailingLists = [new MailingListConfig { Name = "archive", Channel = ChannelKind.File, Directory = _file.Folder }] };
        var killed = new AlertHarness(await _file.OpenAsync(), config, WorkerA);
        await killed.CycleAsync((Pair("weights"), [Critical(FindingKind.BecamePerfect, "weighed_kg became an exact copy of declared_kg")]));
        Assert.Single(await killed.Outbox.ClaimDueAsync(killed.Time.GetUtcNow(), WorkerA.Lease, WorkerA.ClaimOwner, 10, CancellationToken.None));

        // worker-a may still be sending it: worker-b must not take it.
        var other = new AlertHarness(await _file.OpenAsync(), config, WorkerA with { ClaimOwner = "worker-b" });
        var takenBack = await other.Dispatcher.TakeBackOwnClaimsAsync(CancellationToken.None);
        var during = await other.Dispatcher.DispatchDueAsync(CancellationToken.None);
        other.Time.Advance(WorkerA.Lease);
        var after = await other.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal(0, takenBack);
        Assert.Equal(0, during.Sent + during.Failed);
        Assert.Equal(1, after.Sent);
    }

    [Fact]
    public async Task Dispatch_SlowSend_RenewsTheLeaseSoNoOtherDispatcherTakesTheMessage()
    {
        var config = new AlertingConfig { MailingLists = [new MailingListConfig { Name = "archive", Channel = ChannelKind.File, Directory = _file.Folder }] };
        var harness = new AlertHarness(await _file.OpenAsync(), config, WorkerA);
        await harness.CycleAsync((Pair("weights"), [Critical(FindingKind.BecamePerfect, "weighed_kg became an exact copy of declared_kg")]));
        var slow = new HeldChannel();
        var dispatcher = new OutboxDispatcher(harness.Outbox, [slow], config, WorkerA, harness.Time, new Random(7), NullLogger<OutboxDispatcher>.Instance);
        var leaseEnd = harness.Time.GetUtcNow() + WorkerA.Lease;

        var sending = dispatcher.DispatchDueAsync(CancellationToken.None);
        await slow.Entered.Task.WaitAsync(TimeSpan.FromSeconds(30));
        // The clock moves while the message is in hand, until a renewal has pushed the lease past its first end.
        for (var step = 0; (await harness.Outbox.ListOutboxAsync(true, 1, CancellationToken.None))[0].NextAttemptAt <= leaseEnd; step++)
        {
            Assert.True(step < 500, "the lease of a message in hand was never renewed");
            if (harness.Time.GetUtcNow() < leaseEnd - TimeSpan.FromSeconds(5))
            {
                harness.Time.Advance(TimeSpan.FromSeconds(5));
            }

            await Task.Delay(10);
        }

        var taken = await harness.Outbox.ClaimDueAsync(leaseEnd, WorkerA.Lease, "worker-b", 10, CancellationToken.None);
        slow.Release.SetResult();
        var result = await sending;

        Assert.Empty(taken);
        Assert.Equal(1, result.Sent);
        Assert.Empty(await harness.Outbox.ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None));
    }

    public void Dispose() => _file.Dispose();

    /// <summary>A channel that holds the message until released, as a slow server would.</summary>
    private sealed class HeldChannel : IAlertChannel
    {
        public TaskCompletionSource Entered { get; } = new(TaskCreationOptions.RunContinuationsAsynchronously);

        public TaskCompletionSource Release { get; } = new(TaskCreationOptions.RunContinuationsAsynchronously);

        public ChannelKind Kind => ChannelKind.File;

        public ChannelBody Body => ChannelBody.Mail;

        public async Task SendAsync(OutboxEntry entry, MailingListConfig list, CancellationToken cancellationToken)
        {
            Entered.TrySetResult();
            await Release.Task.WaitAsync(cancellationToken);
        }
    }
}
