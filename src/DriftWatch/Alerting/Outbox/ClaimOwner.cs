using DriftWatch.Core.Configuration;

namespace DriftWatch.Alerting.Outbox;

/// <summary>
/// Who a claimed outbox row belongs to. The worker's name must be the same after a restart (so it can take its own
/// claims back at once) and differ between workers sharing the store (so it never takes another's):
/// <c>worker.id</c>, else the host name. One-shot commands (<c>check</c>, the demo) add their process id: a worker
/// starting on the same host must not take back a mail such a command is sending right now.
/// </summary>
internal static class ClaimOwner
{
    public static string OfWorker(WorkerConfig worker)
    {
        ArgumentNullException.ThrowIfNull(worker);
        return worker.Id ?? Environment.MachineName;
    }

    public static string OfOneShot(WorkerConfig worker) => $"{OfWorker(worker)}/pid-{Environment.ProcessId}";
}
