using DriftWatch.Core.Configuration;
using DriftWatch.Workers;
using Quartz;

namespace DriftWatch.Scheduling;

/// <summary>
/// <c>worker.shared_schedule</c>: Quartz's ADO.NET job store, clustered, in the PostgreSQL store's database (tables
/// qrtz_*, created by migration 010). Every worker on the store shares the scheduler name, so each trigger fires on
/// one of them; a worker silent for <see cref="WorkerConfig.TakeoverAfter"/> is taken for dead and the checks it
/// had in flight (jobs that request recovery) run again on another. The stored jobs are brought in line with the
/// configuration by <see cref="StoredSchedules"/>, never replaced wholesale, so slots missed while every worker was
/// down are still due at the next start.
/// </summary>
internal static class SharedSchedule
{
    /// <summary>The same on every worker: Quartz's <c>sched_name</c> column, which makes them one cluster.</summary>
    public const string SchedulerName = "DriftWatch";

    /// <summary>
    /// A trigger late by up to this much fires each missed slot (a takeover after a worker died stays within it);
    /// later, the pair's trigger fires once and proceeds (<see cref="PairSchedules.Cron"/>).
    /// </summary>
    public static readonly TimeSpan MisfireThreshold = TimeSpan.FromSeconds(60);

    public static void Configure(IQuartzBuilder quartz, DriftWatchConfig config, WorkerIdentity identity)
    {
        ArgumentNullException.ThrowIfNull(quartz);
        ArgumentNullException.ThrowIfNull(config);
        ArgumentNullException.ThrowIfNull(identity);
        quartz.ConfigureScheduler(o =>
        {
            o.InstanceName = SchedulerName;
            o.InstanceId = identity.Id;
        });
        quartz.UsePersistentStore(store =>
        {
            store.UsePostgres(config.Store.ConnectionString);
            store.UseClustering(c =>
            {
                c.CheckinInterval = config.Worker.Heartbeat;
                c.CheckinMisfireThreshold = config.Worker.TakeoverAfter;
            });
            store.UseSystemTextJsonSerializer();
            store.ConfigureStore(o => o.MisfireThreshold = MisfireThreshold);
        });
    }
}
