using DriftWatch.Alerting.Digest;
using DriftWatch.Alerting.Outbox;
using DriftWatch.Alerting.Routing;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Alerting.Evaluation;

/// <summary>
/// One alerting cycle, called by the monitor after it has recorded the runs: false-discovery step over the
/// cycle's p-value findings, lifecycle, addressing, one digest per mailing list, and the states, the outbox rows and
/// the run feed's watermark in one transaction. Sending is the dispatcher's job (woken here); an SMTP outage cannot lose an alert.
/// </summary>
internal sealed class AlertCycleProcessor(
    IAlertStore store,
    AlertingConfig config,
    TimeProvider time,
    OutboxSignal signal,
    ILogger<AlertCycleProcessor> logger)
{
    /// <param name="outcomes">This cycle's checks, findings as the comparison produced them (the FDR step is applied here).</param>
    /// <param name="contexts">Per pair name: its configuration and the profiles and points a digest shows.</param>
    /// <param name="position">The run feed's position after these outcomes, committed with them (null when they came from no feed).</param>
    public async Task<AlertCycleResult> ProcessAsync(
        IReadOnlyList<PairOutcome> outcomes,
        IReadOnlyDictionary<string, AlertPairContext> contexts,
        FeedPosition? position,
        CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(outcomes);
        ArgumentNullException.ThrowIfNull(contexts);
        var now = time.GetUtcNow();
        var pairs = outcomes.Select(o => o.Pair).Distinct(StringComparer.Ordinal).ToArray();
        var open = await store.GetOpenAlertsAsync(pairs, cancellationToken);
        var filtered = FalseDiscoveryControl.FilterCycle(outcomes, config.FdrQ, [.. open.Where(a => a.IsOpen).Select(a => (a.Pair, a.Kind))]);
        LogDropped(outcomes, filtered);

        var snoozes = await store.GetActiveSnoozesAsync(now, cancellationToken);
        var decision = AlertLifecycle.Evaluate(filtered, open, snoozes, config, now);

        // Composed inside the store's transaction, after the states are written: a new alert's mail names the id
        // that 'alerts ack' and the dashboard use. Message-Ids do not depend on it (MessageIds), so a retried cycle
        // still finds its messages already stored.
        var outbox = new List<OutboxMessage>();
        var saved = await store.ApplyCycleAsync(decision, stored => ComposeAll(decision, stored, contexts, now, outbox), position, cancellationToken);
        if (outbox.Count > 0)
        {
            signal.Notify();
        }

        foreach (var notice in decision.Notifications)
        {
            logger.LogInformation("Alert {Pair}/{Kind} {Transition} ({Severity})", notice.Alert.Pair, notice.Alert.Kind, notice.Kind, notice.Alert.Severity);
        }

        return new AlertCycleResult(decision, saved, outbox);
    }

    private List<OutboxMessage> ComposeAll(
        CycleDecision decision, IReadOnlyList<AlertState> stored, IReadOnlyDictionary<string, AlertPairContext> contexts, DateTimeOffset now, List<OutboxMessage> outbox)
    {
        // A notification of a new alert carries the unsaved state (id 0); the saved one has its id.
        var ids = stored.Where(s => s.Id > 0).GroupBy(s => (s.Pair, s.Kind)).ToDictionary(g => g.Key, g => g.Last());
        var items = decision.Notifications
            .Select(n => n.Alert.Id == 0 && ids.TryGetValue((n.Alert.Pair, n.Alert.Kind), out var saved) ? n with { Alert = n.Alert with { Id = saved.Id } } : n)
            .Select(n => new DigestItem(n, contexts.TryGetValue(n.Alert.Pair, out var context) ? context : AlertPairContext.Unknown(n.Alert.Pair)))
            .ToArray();
        outbox.Clear();
        var options = new DigestOptions(config.Smtp?.From ?? DigestOptions.DefaultFrom, config.PublicUrl);
        foreach (var digest in AlertAddressing.Address(items, config.MailingLists))
        {
            if (Compose(digest, options, now) is { } message)
            {
                outbox.Add(message);
            }
        }

        return outbox;
    }

    private OutboxMessage? Compose(AddressedDigest digest, DigestOptions options, DateTimeOffset now)
    {
        // Per mailing list: one list's bad configuration (an unparsable recipient, say) never holds back the others.
        try
        {
            if (digest.List.Channel == ChannelKind.Webhook)
            {
                return DigestWebhookBody.Compose(digest, options.PublicUrl, now);
            }

            using var message = DigestComposer.Compose(digest, options, now);
            return DigestComposer.ToOutbox(message, digest, now);
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            logger.LogError(ex, "Could not compose the alert digest for mailing list {MailingList} ({Count} alerts); it is not queued", digest.List.Name, digest.Items.Count);
            return null;
        }
    }

    private void LogDropped(IReadOnlyList<PairOutcome> before, IReadOnlyList<PairOutcome> after)
    {
        var dropped = before.Sum(o => o.Findings.Count) - after.Sum(o => o.Findings.Count);
        if (dropped > 0)
        {
            logger.LogInformation("False-discovery step (q = {Q}) held back {Dropped} findings from alerting; they stay in the history", config.FdrQ, dropped);
        }
    }
}
