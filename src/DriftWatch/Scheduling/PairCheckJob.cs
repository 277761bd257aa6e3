using DriftWatch.Hosting;
using DriftWatch.Monitoring;
using Microsoft.Extensions.Logging;
using Quartz;

namespace DriftWatch.Scheduling;

/// <summary>
/// The scheduled check of one pair, then an immediate alert evaluation. <see cref="DisallowConcurrentExecutionAttribute"/> is per job key,
/// and each pair has its own job, so a slow run of a pair delays that pair's next run instead of overlapping it.
/// </summary>
[DisallowConcurrentExecution]
internal sealed class PairCheckJob(
    LiveConfig config,
    SlotGroups groups,
    StopGrace stop,
    RunningChecks running,
    ILogger<PairCheckJob> logger,
    Workers.LastCheck? lastCheck = null,
    TimeProvider? time = null,
    Store.RunSlots? recorded = null) : IJob
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

        var slot = ScheduleSlot.Of(context);
        // A stop request does not cancel the check at once: it goes on until the grace runs out.
        using var linked = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken, stop.Expired);
        // The pairs of its table group due in the same slot are checked with it (one shared read); none when
        // another pair's job already checked this one for the slot.
        var pairs = await groups.ClaimAsync(pair, slot, context.Recovering, linked.Token);
        if (context.Recovering && slot is { } due && recorded is not null)
        {
            // The worker that died may have recorded some of these runs before the scheduler could mark the job done.
            var unrecorded = new List<Core.Configuration.PairConfig>(pairs.Count);
            foreach (var claimed in pairs)
            {
                if (await recorded.IsRecordedAsync(claimed.Name, due, linked.Token))
                {
                    logger.LogInformation("Check of {Pair} for the slot {Slot:u} is already recorded; the recovered job does not check it again", claimed.Name, due);
                }
                else
                {
                    unrecorded.Add(claimed);
                }
            }

            pairs = unrecorded;
        }

        if (pairs.Count == 0)
        {
            return;
        }

        logger.LogDebug("Check of {Pair} started ({Count} pairs of its table group)", pair.Name, pairs.Count);
        running.Started();
        lastCheck?.Started(pair.Name, (time ?? TimeProvider.System).GetUtcNow());
        bool last;
        try
        {
            // The runs record the slot they were for, so "each slot checked once" can be read back from the store.
            await groups.CheckAsync(pairs, slot, linked.Token);
        }
        finally
        {
            last = running.Finished();
        }

        // Judge the new runs now rather than at the next interval, so alert states (and the /metrics gauge read
        // from them) follow the checks. Only the last check of a batch still running fires it: the false-discovery
        // step works over one evaluation's runs, so the pairs that ran together stay one family. If two checks
        // finish at the same moment, exactly one of them is the last.
        // The alert job refuses concurrent runs: a request waits for the running one, then sees what it did not.
        if (last && !linked.IsCancellationRequested)
        {
            await context.Scheduler.TriggerJob(SchedulingSetup.AlertJobKey, cancellationToken);
        }
    }
}
