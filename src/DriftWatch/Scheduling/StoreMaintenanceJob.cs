using DriftWatch.Core.Configuration;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;
using Quartz;

namespace DriftWatch.Scheduling;

/// <summary>Applies the store's retention: old runs (with their findings) go, older runs' sampled points go first.</summary>
[DisallowConcurrentExecution]
internal sealed class StoreMaintenanceJob(DriftWatchConfig config, IHistoryStore history, TimeProvider time, ILogger<StoreMaintenanceJob> logger) : IJob
{
    public static readonly TimeSpan Every = TimeSpan.FromHours(1);

    public async ValueTask Execute(IJobExecutionContext context, CancellationToken cancellationToken)
    {
        var now = time.GetUtcNow();
        var deleted = await history.PruneAsync(now - config.Store.Retention, now - config.Store.PointsRetention, cancellationToken);
        if (deleted > 0)
        {
            logger.LogInformation("Retention: deleted {Runs} runs older than {Retention}", deleted, config.Store.Retention);
        }
    }
}
