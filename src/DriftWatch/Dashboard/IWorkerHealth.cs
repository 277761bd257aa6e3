namespace DriftWatch.Dashboard;

/// <summary>
/// What <c>/healthz</c> asks the worker beyond the store: is the scheduler running? The host registers one
/// (see <see cref="WorkerHealth.From"/>); without one, /healthz reports that this process runs no scheduler
/// and judges the store alone (the dashboard served on its own, as in <c>demo --serve</c>).
/// </summary>
internal interface IWorkerHealth
{
    bool IsSchedulerRunning { get; }
}

internal static class WorkerHealth
{
    public static IWorkerHealth From(Func<bool> isSchedulerRunning)
    {
        ArgumentNullException.ThrowIfNull(isSchedulerRunning);
        return new FuncHealth(isSchedulerRunning);
    }

    private sealed class FuncHealth(Func<bool> isSchedulerRunning) : IWorkerHealth
    {
        public bool IsSchedulerRunning => isSchedulerRunning();
    }
}
