using DriftWatch.Hosting;
using DriftWatch.Spool;

namespace DriftWatch.Dashboard;

/// <summary>
/// What <c>/healthz</c> and <c>/metrics</c> show of the worker beyond its scheduler: the spool of runs waiting for
/// the store and the configuration in force. Registered by <c>run</c> only; the dashboard served alone has neither.
/// </summary>
internal interface IWorkerStatus
{
    SpoolStatus Spool { get; }

    ConfigStatus Configuration { get; }
}
