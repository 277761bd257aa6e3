using DriftWatch.Alerting.Channels;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Alerting.Outbox;

/// <summary>
/// Sends what the outbox holds. Each message is claimed (leased to this dispatcher's owner), sent, then marked sent;
/// a failure records the error and schedules the next attempt with backoff and jitter. The leases of a batch in hand
/// are renewed while it is sent, so they can be short: a dispatcher that dies frees its messages within one lease,
/// and a worker restarted under the same name takes them back at once (<see cref="TakeBackOwnClaimsAsync"/>). When a mailing list's channel is down, that list's
/// other claimed messages wait for their lease to run out instead of each waiting on the same dead server,
/// while the other lists carry on. Nothing is ever dropped: an outage only delays. The one exception is a message the
/// receiver refused for good (<see cref="MessageRefusedException"/>): it is recorded as failed, kept for audit and not
/// tried again, since a retry would be refused the same way.
/// </summary>
internal sealed class OutboxDispatcher(
    IOutboxStore store,
    IEnumerable<IAlertChannel> channels,
    AlertingConfig config,
    OutboxOptions options,
    TimeProvider time,
    Random jitter,
    ILogger<OutboxDispatcher> logger)
{
    private readonly Dictionary<ChannelKind, IAlertChannel> _channels = channels.ToDictionary(c => c.Kind);

    // Mailing lists whose receiver asked to be left alone (Retry-After) until when: the wait is the receiver's, not
    // one message's, so none of the list's messages is tried before then.
    private readonly System.Collections.Concurrent.ConcurrentDictionary<string, DateTimeOffset> _pausedUntil = new(StringComparer.Ordinal);

    /// <summary>Works off every message due now, batch after batch.</summary>
    public async Task<DispatchResult> DispatchDueAsync(CancellationToken cancellationToken)
    {
        var total = DispatchResult.None;
        while (true)
        {
            var batch = await store.ClaimDueAsync(time.GetUtcNow(), options.Lease, options.ClaimOwner, options.BatchSize, cancellationToken);
            if (batch.Count == 0)
            {
                return total;
            }

            var result = await DispatchBatchAsync(batch, cancellationToken);
            total = new DispatchResult(total.Sent + result.Sent, total.Failed + result.Failed, total.Deferred + result.Deferred);
            if (batch.Count < options.BatchSize)
            {
                return total;
            }
        }
    }

    /// <summary>
    /// Makes the messages this owner had claimed before a crash or a kill due now. Called by the worker at start,
    /// before its first dispatch: nothing of this owner can be in hand yet.
    /// </summary>
    public async Task<int> TakeBackOwnClaimsAsync(CancellationToken cancellationToken)
    {
        var taken = await store.TakeBackClaimsAsync(options.ClaimOwner, time.GetUtcNow(), cancellationToken);
        if (taken > 0)
        {
            logger.LogWarning("Took back {Count} alert messages claimed by {Owner} before it stopped; they are sent now (one accepted just before the stop may arrive twice, with the same Message-Id)", taken, options.ClaimOwner);
        }

        return taken;
    }

    private async Task<DispatchResult> DispatchBatchAsync(IReadOnlyList<OutboxEntry> batch, CancellationToken cancellationToken)
    {
        var inHand = new HashSet<long>(batch.Select(e => e.Id));
        using var stopRenewing = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        var renewing = KeepLeasesAsync(inHand, stopRenewing.Token);
        try
        {
            return await SendBatchAsync(batch, inHand, cancellationToken);
        }
        finally
        {
            await stopRenewing.CancelAsync();
            await renewing;
        }
    }

    private async Task<DispatchResult> SendBatchAsync(IReadOnlyList<OutboxEntry> batch, HashSet<long> inHand, CancellationToken cancellationToken)
    {
        var down = new HashSet<string>(StringComparer.Ordinal);
        int sent = 0, failed = 0, deferred = 0;
        foreach (var entry in batch)
        {
            if (_pausedUntil.TryGetValue(entry.MailingList, out var until) && until > time.GetUtcNow())
            {
                // Due again when the pause ends, not when its lease runs out; not an attempt, so no backoff grows.
                Release(inHand, entry.Id);
                await store.RenewClaimsAsync([entry.Id], options.ClaimOwner, until, cancellationToken);
                deferred++;
                continue;
            }

            if (down.Contains(entry.MailingList))
            {
                // Claimed but not tried: no longer renewed, its lease brings it back once it runs out.
                deferred++;
                Release(inHand, entry.Id);
                continue;
            }

            try
            {
                await SendAsync(entry, cancellationToken);
                await store.MarkSentAsync(entry.Id, time.GetUtcNow(), cancellationToken);
                sent++;
                logger.LogInformation("Sent alert message {MessageId} on mailing list {MailingList} ({Subject})", entry.MessageId, entry.MailingList, entry.Subject);
            }
            catch (OperationCanceledException) when (cancellationToken.IsCancellationRequested)
            {
                throw;
            }
            catch (Exception ex)
            {
                // Per message: one failure is recorded and the loop carries on with the next.
                failed++;
                if (ex is ChannelUnavailableException)
                {
                    down.Add(entry.MailingList);
                }

                if (ex is MessageRefusedException)
                {
                    await RecordRefusalAsync(entry, ex, cancellationToken);
                }
                else
                {
                    await RecordFailureAsync(entry, ex, cancellationToken);
                }
            }
            finally
            {
                Release(inHand, entry.Id);
            }
        }

        return new DispatchResult(sent, failed, deferred);
    }

    private static void Release(HashSet<long> inHand, long id)
    {
        lock (inHand)
        {
            inHand.Remove(id);
        }
    }

    /// <summary>Renews the leases of the batch's messages not yet sent, failed or deferred, until the batch is done.</summary>
    private async Task KeepLeasesAsync(HashSet<long> inHand, CancellationToken stop)
    {
        try
        {
            while (true)
            {
                await Task.Delay(options.RenewEvery, time, stop);
                long[] ids;
                lock (inHand)
                {
                    ids = [.. inHand];
                }

                if (ids.Length == 0)
                {
                    return;
                }

                try
                {
                    await store.RenewClaimsAsync(ids, options.ClaimOwner, time.GetUtcNow() + options.Lease, stop);
                }
                catch (Exception ex) when (ex is not OperationCanceledException)
                {
                    // The next renewal tries again; at worst a lease runs out and the message may be sent twice.
                    logger.LogWarning(ex, "Could not renew the leases of {Count} alert messages in hand", ids.Length);
                }
            }
        }
        catch (OperationCanceledException) when (stop.IsCancellationRequested)
        {
            // The batch is done (or the dispatcher is stopping): nothing left to renew.
        }
    }

    private async Task SendAsync(OutboxEntry entry, CancellationToken cancellationToken)
    {
        var list = config.MailingLists.FirstOrDefault(r => string.Equals(r.Name, entry.MailingList, StringComparison.Ordinal))
            ?? throw new ChannelUnavailableException($"Mailing list '{entry.MailingList}' is no longer configured; the message waits until it is.");
        if (!_channels.TryGetValue(list.Channel, out var channel))
        {
            throw new ChannelUnavailableException($"No {list.Channel} channel is registered for mailing list '{list.Name}'.");
        }

        // The stored bytes were composed for the channel the list had then; a list moved between mail and webhook
        // cannot send them (a retry would not change that), a list moved between smtp and file can.
        if (_channels.TryGetValue(entry.Channel, out var composedFor) && composedFor.Body != channel.Body)
        {
            throw new MessageRefusedException(
                $"Message {entry.MessageId} was composed for the {Output.JsonContract.Name(entry.Channel)} channel, but mailing list '{list.Name}' now sends by {Output.JsonContract.Name(list.Channel)}; it cannot be sent in that form.");
        }

        await channel.SendAsync(entry, list, cancellationToken);
    }

    private async Task RecordRefusalAsync(OutboxEntry entry, Exception ex, CancellationToken cancellationToken)
    {
        logger.LogError("Alert message {MessageId} on mailing list {MailingList} was refused and will not be retried (attempt {Attempt}): {Reason}",
            entry.MessageId, entry.MailingList, entry.Attempts + 1, ex.Message);
        try
        {
            await store.MarkGivenUpAsync(entry.Id, ex.Message, time.GetUtcNow(), cancellationToken);
        }
        catch (Exception storeError) when (storeError is not OperationCanceledException)
        {
            // The lease brings the message round again; it will be refused again and recorded then.
            logger.LogError(storeError, "Could not record the refusal of alert message {MessageId}", entry.MessageId);
        }
    }

    private async Task RecordFailureAsync(OutboxEntry entry, Exception ex, CancellationToken cancellationToken)
    {
        var attempt = entry.Attempts + 1;
        var wait = RetryBackoff.Delay(attempt, options, jitter);
        if (ex is ChannelUnavailableException { RetryAfter: { } asked } && asked > wait)
        {
            // A receiver that says when to come back is taken at its word, up to the longest backoff: a bad header
            // must not park alerts for days.
            wait = asked < options.RetryMax ? asked : options.RetryMax;
            _pausedUntil[entry.MailingList] = time.GetUtcNow() + wait;
        }

        var next = time.GetUtcNow() + wait;
        // One line per failed attempt: an outage repeats it every retry, so the stack trace waits for debug level.
        logger.LogWarning("Alert message {MessageId} on mailing list {MailingList} failed (attempt {Attempt}): {Reason}; next attempt at {NextAttempt}",
            entry.MessageId, entry.MailingList, attempt, ex.Message, next);
        logger.LogDebug(ex, "Alert message {MessageId} failed with this exception", entry.MessageId);
        try
        {
            await store.MarkFailedAsync(entry.Id, ex.Message, next, cancellationToken);
        }
        catch (Exception storeError) when (storeError is not OperationCanceledException)
        {
            // The lease still holds the message back and brings it round again; nothing is lost.
            logger.LogError(storeError, "Could not record the failure of alert message {MessageId}", entry.MessageId);
        }
    }
}
