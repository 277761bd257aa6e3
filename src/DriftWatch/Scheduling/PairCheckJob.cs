using DriftWatch.Hosting;
using DriftWatch.Monitoring;
using Microsoft.Extensions.Logging;
using Quartz;

namespace DriftWatch.Scheduling;

/// <summary>
/// The scheduled check of one pair. <see cref="DisallowConcurrentExecutionAttribute"/> is per job key,
/// and each pair has its own job, so a slow run of a pair delays that pair's next run instead of overlapping it.
/// </summary>
[DisallowConcurrentExecution]
internal sealed class PairCheckJob(LiveConfig config, PairChecker checker, StopGrace stop, ILogger<PairCheckJob> logger) : IJob
{
    public const string PairKey = "pair";

    public async ValueTask Execute(IJobExecutionContext context, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(context);
        var name = context.MergedJobDataMap.GetString(PairKey);
        // The configuration in force now: a reload may have changed the pair since it was scheduled.
        var pair = name is null ? null : config.Current.FindPair(name);
        if (pair is null)
        {
            return;
        }

        // A stop request does not cancel the check at once: it goes on until the grace runs out.
        using var linked = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken, stop.Expired);
        logger.LogDebug("Check of {Pair} started", pair.Name);
        await checker.CheckAsync(pair, linked.Token);
    }
}
