using DriftWatch.Core.Configuration;
using DriftWatch.Hosting;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Quartz;

namespace DriftWatch.Scheduling;

/// <summary>
/// With a shared schedule the jobs live in the store and outlast every worker: at start (before the scheduler runs)
/// and after each reload, the stored jobs are brought in line with the configuration in force. A pair whose job
/// and schedule are already stored keeps its trigger untouched (its next fire time, hence its missed slots, are
/// kept); a new pair or a changed schedule is written; a stored pair the configuration no longer has is deleted.
/// Several workers doing this at once write the same thing.
/// </summary>
internal sealed class StoredSchedules(ISchedulerFactory factory, LiveConfig live, ILogger<StoredSchedules> logger) : IHostedService
{
    public static readonly JobKey MaintenanceJobKey = new("store-retention", "maintenance");

    public async Task StartAsync(CancellationToken cancellationToken)
    {
        var scheduler = await factory.GetScheduler(cancellationToken);
        await ReconcileAsync(scheduler, live.Current, logger, cancellationToken);
    }

    public Task StopAsync(CancellationToken cancellationToken) => Task.CompletedTask;

    public static async Task ReconcileAsync(IScheduler scheduler, DriftWatchConfig config, ILogger logger, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(scheduler);
        ArgumentNullException.ThrowIfNull(config);
        ArgumentNullException.ThrowIfNull(logger);
        var wanted = config.Pairs.ToDictionary(p => p.Name, StringComparer.Ordinal);
        foreach (var stored in await scheduler.GetJobKeys(GroupMatcher<JobKey>.GroupEquals(PairSchedules.Group), cancellationToken))
        {
            if (!wanted.ContainsKey(stored.Name) && await DeleteSharedAsync(scheduler, stored, cancellationToken))
            {
                logger.LogInformation("Shared schedule: pair {Pair} is not in the configuration; its stored job was deleted", stored.Name);
            }
        }

        foreach (var pair in config.Pairs)
        {
            await EnsurePairAsync(scheduler, pair, logger, cancellationToken);
        }

        await EnsureIntervalAsync(scheduler, SchedulingSetup.AlertJobKey, JobBuilder.Create<AlertCycleJob>().WithIdentity(SchedulingSetup.AlertJobKey).WithDescription("evaluate alerts and deliver the outbox").Build(), config.Worker.AlertEvery, cancellationToken);
        await EnsureIntervalAsync(scheduler, MaintenanceJobKey, JobBuilder.Create<StoreMaintenanceJob>().WithIdentity(MaintenanceJobKey).WithDescription("apply the store's retention").Build(), StoreMaintenanceJob.Every, cancellationToken);
    }

    /// <summary>
    /// Deletes a stored job; true when this call deleted it. Another worker applying the same change may delete it at
    /// the same moment, and Quartz then reports that it could not unschedule the trigger: a job already gone is fine.
    /// </summary>
    public static async Task<bool> DeleteSharedAsync(IScheduler scheduler, JobKey key, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(scheduler);
        try
        {
            return await scheduler.DeleteJob(key, cancellationToken);
        }
        catch (SchedulerException)
        {
            if (await scheduler.GetJobDetail(key, cancellationToken) is not null)
            {
                throw;
            }

            return false;
        }
    }

    /// <summary>Writes the pair's job and trigger unless the stored ones already say the same; true when it wrote.</summary>
    public static async Task<bool> EnsurePairAsync(IScheduler scheduler, PairConfig pair, ILogger logger, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(scheduler);
        ArgumentNullException.ThrowIfNull(pair);
        var triggerKey = PairSchedules.TriggerKeyOf(pair.Name);
        var existing = await scheduler.GetTrigger(triggerKey, cancellationToken) as ICronTrigger;
        var jobStored = await scheduler.GetJobDetail(PairSchedules.JobKeyOf(pair.Name), cancellationToken) is not null;
        if (jobStored && existing is not null && existing.CronExpressionString == pair.Schedule && existing.TimeZone?.Id == TimeZoneInfo.Utc.Id)
        {
            return false;
        }

        // The check requests recovery: if its worker dies mid-check, another worker runs that slot again.
        var job = JobBuilder.Create<PairCheckJob>()
            .WithIdentity(PairSchedules.JobKeyOf(pair.Name))
            .UsingJobData(PairCheckJob.PairKey, pair.Name)
            .WithDescription($"check {pair.Name}")
            .RequestRecovery()
            .Build();
        var trigger = TriggerBuilder.Create().ForJob(job.Key).WithIdentity(triggerKey).WithSchedule(PairSchedules.Cron(pair)).Build();
        await scheduler.ScheduleJob(job, [trigger], ScheduleJobOptions.Replacing, cancellationToken);
        logger.LogInformation("Shared schedule: pair {Pair} stored with schedule {Schedule}", pair.Name, pair.Schedule);
        return true;
    }

    private static async Task EnsureIntervalAsync(IScheduler scheduler, JobKey key, IJobDetail job, TimeSpan every, CancellationToken cancellationToken)
    {
        var triggerKey = new TriggerKey(key.Name, key.Group);
        if (await scheduler.GetTrigger(triggerKey, cancellationToken) is ISimpleTrigger existing && existing.RepeatInterval == every && await scheduler.GetJobDetail(key, cancellationToken) is not null)
        {
            return;
        }

        var trigger = TriggerBuilder.Create()
            .ForJob(key)
            .WithIdentity(triggerKey)
            .WithSchedule(SimpleScheduleBuilder.Create().WithInterval(every).RepeatForever()
                .WithMisfireInstruction(SimpleTriggerMisfireInstruction.NextWithRemainingCount))
            .Build();
        await scheduler.ScheduleJob(job, [trigger], ScheduleJobOptions.Replacing, cancellationToken);
    }
}
