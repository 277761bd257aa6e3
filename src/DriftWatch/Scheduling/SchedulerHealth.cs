using DriftWatch.Dashboard;
using Quartz;

namespace DriftWatch.Scheduling;

/// <summary>For /healthz: the worker's scheduler is running (not created, in standby, or shutting down).</summary>
internal sealed class SchedulerHealth(ISchedulerFactory factory) : IWorkerHealth
{
    private IScheduler? _scheduler;

    public bool IsSchedulerRunning
    {
        get
        {
            // The factory hands out one scheduler; asking once and keeping it avoids a blocking call per probe.
            _scheduler ??= factory.GetScheduler(CancellationToken.None).AsTask().GetAwaiter().GetResult();
            return _scheduler.Status == SchedulerStatus.Running;
        }
    }
}
