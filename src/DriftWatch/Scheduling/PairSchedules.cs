using DriftWatch.Core.Configuration;
using DriftWatch.Hosting;
using Microsoft.Extensions.Logging;
using Quartz;

namespace DriftWatch.Scheduling;

/// <summary>
/// A pair's Quartz job and cron trigger, at start (<see cref="SchedulingSetup"/>) and when a reload adds, removes or
/// reschedules pairs in the running scheduler (<see cref="ApplyAsync"/>).
/// </summary>
internal static class PairSchedules
{
    public const string Group = "pairs";

    public static JobKey JobKeyOf(string pair) => new(pair, Group);

    public static TriggerKey TriggerKeyOf(string pair) => new(pair, Group);

    /// <summary>UTC; after downtime a pair runs once, not once per missed slot.</summary>
    public static CronScheduleBuilder Cron(PairConfig pair)
    {
        ArgumentNullException.ThrowIfNull(pair);
        return CronScheduleBuilder.Create(pair.Schedule)
            .InTimeZone(TimeZoneInfo.Utc)
            .WithMisfireInstruction(CronTriggerMisfireInstruction.FireAndProceed);
    }

    private static ITrigger Trigger(PairConfig pair) =>
        TriggerBuilder.Create().ForJob(JobKeyOf(pair.Name)).WithIdentity(TriggerKeyOf(pair.Name)).WithSchedule(Cron(pair)).Build();

    /// <summary>Brings the running scheduler in line with <paramref name="changes"/>; one log line per change.</summary>
    /// <param name="shared">
    /// A shared schedule (<see cref="SharedSchedule"/>): the other workers reload the same file and may have stored the
    /// change already, so added and rescheduled pairs are written only where the stored job differs.
    /// </param>
    public static async Task ApplyAsync(IScheduler scheduler, ConfigChanges changes, ILogger logger, CancellationToken cancellationToken, bool shared = false)
    {
        ArgumentNullException.ThrowIfNull(scheduler);
        ArgumentNullException.ThrowIfNull(changes);
        ArgumentNullException.ThrowIfNull(logger);
        foreach (var pair in changes.Removed)
        {
            // A check of the pair already running finishes and is recorded; no new one starts.
            if (shared)
            {
                await StoredSchedules.DeleteSharedAsync(scheduler, JobKeyOf(pair.Name), cancellationToken);
            }
            else
            {
                await scheduler.DeleteJob(JobKeyOf(pair.Name), cancellationToken);
            }

            logger.LogInformation("Reload: pair {Pair} removed; it is no longer checked", pair.Name);
        }

        if (shared)
        {
            foreach (var pair in changes.Added.Concat(changes.Rescheduled))
            {
                await StoredSchedules.EnsurePairAsync(scheduler, pair, logger, cancellationToken);
                logger.LogInformation("Reload: pair {Pair} checked on schedule {Schedule}", pair.Name, pair.Schedule);
            }
        }

        foreach (var pair in shared ? Array.Empty<PairConfig>() : changes.Added)
        {
            var job = JobBuilder.Create<PairCheckJob>()
                .WithIdentity(JobKeyOf(pair.Name))
                .UsingJobData(PairCheckJob.PairKey, pair.Name)
                .WithDescription($"check {pair.Name}")
                .Build();
            var next = await scheduler.ScheduleJob(job, Trigger(pair), cancellationToken: cancellationToken);
            logger.LogInformation("Reload: pair {Pair} added, schedule {Schedule}, first check {Next:u}", pair.Name, pair.Schedule, next);
        }

        foreach (var pair in shared ? Array.Empty<PairConfig>() : changes.Rescheduled)
        {
            var next = await scheduler.RescheduleJob(TriggerKeyOf(pair.Name), Trigger(pair), cancellationToken);
            logger.LogInformation("Reload: pair {Pair} rescheduled to {Schedule}, next check {Next:u}", pair.Name, pair.Schedule, next);
        }

        foreach (var pair in changes.Changed)
        {
            logger.LogInformation("Reload: pair {Pair} changed; its next check uses the new settings", pair.Name);
        }

        foreach (var source in changes.SourcesChanged)
        {
            logger.LogInformation("Reload: source {Source} changed; checks from now on use the new settings", source);
        }

        foreach (var section in changes.NeedsRestart)
        {
            logger.LogWarning("Reload: the {Section} section changed and needs a restart; the running worker keeps its current {Section} settings", section, section);
        }
    }
}
