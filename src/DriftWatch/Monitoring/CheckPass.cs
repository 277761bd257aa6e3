using DriftWatch.Core.Configuration;

namespace DriftWatch.Monitoring;

/// <summary>
/// One full pass for a set of pairs: every check, then alert evaluation over the runs it recorded, then
/// delivery of what is due. <c>check</c> and the demo use it; the worker runs the same steps on schedules.
/// </summary>
internal sealed class CheckPass(MonitorCycle cycle)
{
    public async Task<IReadOnlyList<PairCheckResult>> RunAsync(IReadOnlyList<PairConfig> pairs, IProgress<PairCheckResult>? progress, CancellationToken cancellationToken)
    {
        var results = await cycle.RunAsync(pairs, progress, cancellationToken);
        return results;
    }
}
