using DriftWatch.Alerting.Evaluation;
using DriftWatch.Monitoring;
using Quartz;

namespace DriftWatch.Scheduling;

/// <summary>Evaluates alerts over the runs recorded since the last evaluation; the dispatcher service then delivers.</summary>
[DisallowConcurrentExecution]
internal sealed class AlertCycleJob(AlertEvaluation evaluation) : IJob
{
    public async ValueTask Execute(IJobExecutionContext context, CancellationToken cancellationToken) =>
        await evaluation.EvaluateNewRunsAsync(cancellationToken);
}
