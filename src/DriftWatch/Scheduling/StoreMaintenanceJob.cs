using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Configuration;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;
using Quartz;

namespace DriftWatch.Scheduling;

/// <summary>
/// Applies the store's retention to every table, in one place: old runs (with their findings) go, older runs'
/// sampled points go first; cleared alerts and ended snoozes go after <see cref="OutboxOptions.ClearedRetention"/>,
/// sent messages after <see cref="OutboxOptions.SentRetention"/>. Open alerts and unsent messages are never
/// deleted; baselines (one per pair) and the feed watermark are replaced, never accumulate. Column hints that no
/// read has refreshed within the run retention go too.
/// </summary>
[DisallowConcurrentExecution]
internal sealed class StoreMaintenanceJob(
    DriftWatchConfig config,
    IHistoryStore history,
    IAlertStore alerts,
    IOutboxStore outbox,
    OutboxOptions outboxOptions,
    TimeProvider time,
    ILogger<StoreMaintenanceJob> logger,
    Workers.ExclusiveWork? exclusive = null,
    ColumnHintStore? hints = null) : IJob
{
    public static readonly TimeSpan Every = TimeSpan.FromHours(1);

    public async ValueTask Execute(IJobExecutionContext context, CancellationToken cancellationToken)
    {
        // Several workers on one store: the retention is applied by one of them at a time (the others skip this hour).
        if (exclusive is null)
        {
            await ApplyRetentionAsync(cancellationToken);
        }
        else
        {
            await exclusive.TryRunAsync(Workers.ExclusiveWork.StoreMaintenance, ApplyRetentionAsync, cancellationToken);
        }
    }

    private async Task ApplyRetentionAsync(CancellationToken cancellationToken)
    {
        var now = time.GetUtcNow();
        var deleted = await history.PruneAsync(now - config.Store.Retention, now - config.Store.PointsRetention, cancellationToken);
        if (deleted > 0)
        {
            logger.LogInformation("Retention: deleted {Runs} runs older than {Retention}", deleted, config.Store.Retention);
        }

        if (hints is not null)
        {
            await hints.PruneAsync(now - config.Store.Retention, cancellationToken);
        }

        var cleared = await alerts.PruneClearedAsync(now - outboxOptions.ClearedRetention, cancellationToken);
        var snoozes = await alerts.PruneEndedSnoozesAsync(now - outboxOptions.ClearedRetention, cancellationToken);
        var sent = await outbox.PruneSentAsync(now - outboxOptions.SentRetention, cancellationToken);
        if (cleared + snoozes + sent > 0)
        {
            logger.LogInformation(
                "Retention: deleted {Cleared} cleared alerts and {Snoozes} ended snoozes older than {ClearedRetention}, {Sent} sent messages older than {SentRetention}",
                cleared, snoozes, outboxOptions.ClearedRetention, sent, outboxOptions.SentRetention);
        }
    }
}
