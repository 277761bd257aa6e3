using DriftWatch.Dashboard;
using DriftWatch.Spool;

namespace DriftWatch.Hosting;

internal sealed class WorkerStatus(RunSpool spool, LiveConfig live) : IWorkerStatus
{
    public SpoolStatus Spool => spool.Status;

    public ConfigStatus Configuration => live.Status;
}
