using DriftWatch.Alerting.Evaluation;
using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Configuration;
using DriftWatch.Monitoring;

namespace DriftWatch.Hosting;

/// <summary>
/// One full pass for a set of pairs: every check, then alert evaluation over the runs recorded since the last
/// evaluation, then delivery of what is due: monitoring ends at "run recorded", alerting starts from there; this
/// is where the two are put in a row. <c>check</c> and the demo use it; the worker runs the same steps on
/// schedules (<see cref="Scheduling.PairCheckJob"/>, <see cref="Scheduling.AlertCycleJob"/>).
/// </summary>
internal sealed class CheckPass(MonitorCycle cycle, AlertEvaluation alerts, OutboxDispatcher outbox)
{
    public Task<CheckPassResult> RunAsync(IReadOnlyList<PairConfig> pairs, IProgress<PairCheckResult>? progress, CancellationToken cancellationToken) =>
        RunAsync(pairs, progress, null, cancellationToken);

    /// <param name="asOf">
    /// Check as of this past time (<c>check --as-of</c>). Its runs are back-dated, which alert evaluation never reads
    /// (<see cref="Store.RunFeed"/>): the evaluation and delivery that follow concern other runs only, so nobody is
    /// mailed about the past.
    /// </param>
    public async Task<CheckPassResult> RunAsync(IReadOnlyList<PairConfig> pairs, IProgress<PairCheckResult>? progress, DateTimeOffset? asOf, CancellationToken cancellationToken)
    {
        var results = await cycle.RunAsync(pairs, progress, asOf, cancellationToken);
        var cycles = await alerts.EvaluateNewRunsAsync(cancellationToken);
        var delivery = await outbox.DispatchDueAsync(cancellationToken);
        return new CheckPassResult(results, cycles, delivery);
    }
}

internal sealed record CheckPassResult(IReadOnlyList<PairCheckResult> Checks, IReadOnlyList<AlertCycleResult> AlertCycles, DispatchResult Delivery)
{
    public int Notifications => AlertCycles.Sum(c => c.Decision.Notifications.Count);

    public int MessagesQueued => AlertCycles.Sum(c => c.Queued.Count);
}
