using System.Globalization;
using DriftWatch.Core.Configuration;

namespace DriftWatch.Workers;

/// <summary>
/// This process among the workers on the store: its row in worker_instances, its Quartz instance id and the holder
/// name on its leases. Unique per process (a restart is a new instance), unlike <c>worker.id</c>, which names the
/// worker across restarts for its outbox claims.
/// </summary>
internal sealed record WorkerIdentity(string Id, string Host, int Pid, DateTimeOffset StartedAt)
{
    public static WorkerIdentity Create(WorkerConfig worker, DateTimeOffset startedAt)
    {
        ArgumentNullException.ThrowIfNull(worker);
        var host = Environment.MachineName;
        var pid = Environment.ProcessId;
        var id = string.Create(CultureInfo.InvariantCulture, $"{worker.Id ?? host}:{pid}:{startedAt.ToUnixTimeMilliseconds()}");
        return new WorkerIdentity(id, host, pid, startedAt);
    }
}
