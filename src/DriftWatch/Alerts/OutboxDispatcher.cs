using DriftWatch.Core.Configuration;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;
using MimeKit;

namespace DriftWatch.Alerts;

/// <summary>
/// Sends what the outbox holds. Each message is claimed (leased), sent, then marked sent; a failure records the
/// error and schedules the next attempt with backoff and jitter. When a mailing list's channel is down, that list's
/// other claimed messages wait for their lease to run out instead of each waiting on the same dead server,
/// while the other lists carry on. Nothing is ever dropped: an outage only delays.
/// </summary>
internal sealed class OutboxDispatcher(
    IAlertStore store,
    IEnumerable<IAlertChannel> channels,
    AlertingConfig config,
    OutboxOptions options,
    TimeProvider time,
    Random jitter,
    ILogger<OutboxDispatcher> logger)
{
    private readonly Dictionary<ChannelKind, IAlertChannel> _channels = channels.ToDictionary(c => c.Kind);

    /// <summary>Works off every message due now, batch after batch.</summary>
    public async Task<DispatchResult> DispatchDueAsync(CancellationToken cancellationToken)
    {
        var total = DispatchResult.None;
        while (true)
        {
            var batch = await store.ClaimDueAsync(time.GetUtcNow(), options.Lease, options.BatchSize, cancellationToken);
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

    /// <summary>Deletes sent messages and cleared alerts past their retention.</summary>
    public Task<int> PruneAsync(CancellationToken cancellationToken)
    {
        var now = time.GetUtcNow();
        return store.PruneAsync(now - options.SentRetention, now - options.ClearedRetention, cancellationToken);
    }

    private async Task<DispatchResult> DispatchBatchAsync(IReadOnlyList<OutboxEntry> batch, CancellationToken cancellationToken)
    {
        var down = new HashSet<string>(StringComparer.Ordinal);
        int sent = 0, failed = 0, deferred = 0;
        foreach (var entry in batch)
        {
            if (down.Contains(entry.MailingList))
            {
                // Claimed but not tried: the lease brings it back once it runs out.
                deferred++;
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

                await RecordFailureAsync(entry, ex, cancellationToken);
            }
        }

        return new DispatchResult(sent, failed, deferred);
    }

    private async Task SendAsync(OutboxEntry entry, CancellationToken cancellationToken)
    {
        var list = config.MailingLists.FirstOrDefault(r => string.Equals(r.Name, entry.MailingList, StringComparison.Ordinal))
            ?? throw new ChannelUnavailableException($"Mailing list '{entry.MailingList}' is no longer configured; the message waits until it is.");
        if (!_channels.TryGetValue(list.Channel, out var channel))
        {
            throw new ChannelUnavailableException($"No {list.Channel} channel is registered for mailing list '{list.Name}'.");
        }

        var bytes = entry.Mime ?? throw new InvalidOperationException($"Outbox entry {entry.Id} was claimed without its message.");
        using var stream = new MemoryStream(bytes, writable: false);
        using var message = await MimeMessage.LoadAsync(stream, cancellationToken);
        await channel.SendAsync(entry, message, list, cancellationToken);
    }

    private async Task RecordFailureAsync(OutboxEntry entry, Exception ex, CancellationToken cancellationToken)
    {
        var attempt = entry.Attempts + 1;
        var next = time.GetUtcNow() + RetryBackoff.Delay(attempt, options, jitter);
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
