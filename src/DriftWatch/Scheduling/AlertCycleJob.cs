using DriftWatch.Alerting.Evaluation;
using DriftWatch.Workers;
using Quartz;

namespace DriftWatch.Scheduling;

/// <summary>
/// Evaluates alerts over the runs recorded since the last evaluation; the dispatcher service then delivers. With
/// several workers on the store one evaluates at a time (a lease): the others skip, and the holder reads every run
/// after the shared watermark, theirs included.
/// </summary>
[DisallowConcurrentExecution]
internal sealed class AlertCycleJob(AlertEvaluation evaluation, ExclusiveWork exclusive) : IJob
{
    public async ValueTask Execute(IJobExecutionContext context, CancellationToken cancellationToken) =>
        await exclusive.TryRunAsync(ExclusiveWork.AlertEvaluation, async ct => await evaluation.EvaluateNewRunsAsync(ct), cancellationToken);
}
