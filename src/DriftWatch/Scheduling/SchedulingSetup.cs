using DriftWatch.Core.Configuration;
using Quartz;

namespace DriftWatch.Scheduling;

internal static class SchedulingSetup
{
    /// <summary>The alert-evaluation job; a pair's check also fires it once done (see <see cref="PairCheckJob"/>).</summary>
    public static readonly JobKey AlertJobKey = new("evaluate-alerts", "alerts");

    /// <summary>The Quartz group of the pairs' check jobs.</summary>
    public const string PairGroup = "pairs";

    /// <summary>One job and one cron trigger per pair; an alert-evaluation job on its own interval.</summary>
    public static void AddPairSchedules(IQuartzBuilder quartz, DriftWatchConfig config, TimeSpan alertEvery)
    {
        ArgumentNullException.ThrowIfNull(quartz);
        ArgumentNullException.ThrowIfNull(config);
        foreach (var pair in config.Pairs)
        {
            var jobKey = PairSchedules.JobKeyOf(pair.Name);
            quartz.AddJob<PairCheckJob>(job => job.WithIdentity(jobKey).UsingJobData(PairCheckJob.PairKey, pair.Name).WithDescription($"check {pair.Name}"));
            quartz.AddTrigger(trigger => trigger.ForJob(jobKey).WithIdentity(PairSchedules.TriggerKeyOf(pair.Name)).WithSchedule(PairSchedules.Cron(pair)));
        }

        var maintenanceKey = new JobKey("store-retention", "maintenance");
        quartz.AddJob<StoreMaintenanceJob>(job => job.WithIdentity(maintenanceKey).WithDescription("apply the store's retention"));
        quartz.AddTrigger(trigger => trigger
            .ForJob(maintenanceKey)
            .WithIdentity("store-retention", "maintenance")
            .WithSchedule(SimpleScheduleBuilder.Create().WithInterval(StoreMaintenanceJob.Every).RepeatForever()
                .WithMisfireInstruction(SimpleTriggerMisfireInstruction.NextWithRemainingCount)));

        var alertKey = AlertJobKey;
        quartz.AddJob<AlertCycleJob>(job => job.WithIdentity(alertKey).WithDescription("evaluate alerts and deliver the outbox"));
        quartz.AddTrigger(trigger => trigger
            .ForJob(alertKey)
            .WithIdentity("evaluate-alerts", "alerts")
            .WithSchedule(SimpleScheduleBuilder.Create().WithInterval(alertEvery).RepeatForever()
                .WithMisfireInstruction(SimpleTriggerMisfireInstruction.NextWithRemainingCount)));
    }
}
