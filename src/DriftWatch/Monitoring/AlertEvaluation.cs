using DriftWatch.Alerts;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Monitoring;

/// <summary>
/// Feeds recorded runs to alerting: reads the runs after the durable watermark, builds one outcome and one
/// digest context per run, and hands them to <see cref="AlertCycleProcessor"/> in cycles that hold at most one
/// run per pair (so a pair's confirm runs count every run). The worker calls it on an interval; <c>check</c>
/// and the demo call it right after their checks: the same path either way.
/// </summary>
internal sealed class AlertEvaluation(
    DriftWatchConfig config,
    RunFeed feed,
    IHistoryStore history,
    AlertCycleProcessor processor,
    ILogger<AlertEvaluation> logger) : IDisposable
{
    public const int BatchSize = 500;

    private readonly SemaphoreSlim _gate = new(1, 1);

    /// <summary>Evaluates every run not yet evaluated; returns the cycles' results.</summary>
    public async Task<IReadOnlyList<AlertCycleResult>> EvaluateNewRunsAsync(CancellationToken cancellationToken)
    {
        // One evaluation at a time in this process: the scheduled job and a manual trigger must not interleave.
        await _gate.WaitAsync(cancellationToken);
        try
        {
            var results = new List<AlertCycleResult>();
            var watermark = await feed.GetWatermarkAsync(RunFeed.AlertsWatermarkKey, cancellationToken);
            while (true)
            {
                var batch = await feed.GetRunsAfterAsync(watermark, BatchSize, cancellationToken);
                if (batch.Count == 0)
                {
                    return results;
                }

                foreach (var cycle in SplitOnePerPair(batch))
                {
                    var result = await EvaluateCycleAsync(cycle, cancellationToken);
                    if (result is not null)
                    {
                        results.Add(result);
                    }

                    watermark = cycle[^1].Id;
                    await feed.SetWatermarkAsync(RunFeed.AlertsWatermarkKey, watermark, cancellationToken);
                }
            }
        }
        finally
        {
            _gate.Release();
        }
    }

    public void Dispose() => _gate.Dispose();

    /// <summary>Consecutive slices of the batch in which no pair appears twice; order is kept.</summary>
    internal static IReadOnlyList<IReadOnlyList<(long Id, string Pair)>> SplitOnePerPair(IReadOnlyList<(long Id, string Pair)> batch)
    {
        var cycles = new List<IReadOnlyList<(long Id, string Pair)>>();
        var current = new List<(long Id, string Pair)>();
        var seen = new HashSet<string>(StringComparer.Ordinal);
        foreach (var run in batch)
        {
            if (!seen.Add(run.Pair))
            {
                cycles.Add(current);
                current = [];
                seen.Clear();
                seen.Add(run.Pair);
            }

            current.Add(run);
        }

        if (current.Count > 0)
        {
            cycles.Add(current);
        }

        return cycles;
    }

    private async Task<AlertCycleResult?> EvaluateCycleAsync(IReadOnlyList<(long Id, string Pair)> cycle, CancellationToken cancellationToken)
    {
        var outcomes = new List<PairOutcome>();
        var contexts = new Dictionary<string, AlertPairContext>(StringComparer.Ordinal);
        foreach (var (id, pairName) in cycle)
        {
            var pair = config.FindPair(pairName);
            if (pair is null)
            {
                // A pair removed from the configuration: its old runs no longer alert anyone.
                continue;
            }

            var run = await history.GetRunAsync(id, includePoints: true, cancellationToken);
            if (run is null)
            {
                continue;
            }

            if (run.Status == RunStatus.Succeeded)
            {
                outcomes.Add(PairOutcome.Success(pair.Name, run.Id, run.Findings));
            }
            else if (run.Status == RunStatus.Unmeasurable)
            {
                // Nothing was learnt about the relationship: counts toward check_failing, clears nothing.
                var failures = await ConsecutiveFailuresAsync(pair, run, cancellationToken);
                outcomes.Add(PairOutcome.Unmeasurable(pair.Name, run.Id, failures, run.Error ?? "no reason was recorded"));
            }
            else
            {
                var failures = await ConsecutiveFailuresAsync(pair, run, cancellationToken);
                outcomes.Add(PairOutcome.Failure(pair.Name, run.Id, failures, run.Error ?? "the check failed"));
            }

            var baseline = await history.GetBaselineAsync(pair.Name, cancellationToken);
            contexts[pair.Name] = new AlertPairContext(pair, run.Profile, run.Points, baseline?.Profile, baseline?.Points)
            {
                Window = run.SourceFigures,
                JudgedAgainst = run.JudgedAgainst,
            };
        }

        if (outcomes.Count == 0)
        {
            return null;
        }

        var result = await processor.ProcessAsync(outcomes, contexts, cancellationToken);
        if (result.Queued.Count > 0)
        {
            logger.LogInformation("Alert cycle over {Runs} runs queued {Messages} messages", outcomes.Count, result.Queued.Count);
        }

        return result;
    }

    /// <summary>
    /// Failed or unmeasurable runs in a row ending with <paramref name="run"/>, counted from the history (enough to
    /// decide check_failing): a pair whose window is empty day after day is as unwatched as one that cannot be read.
    /// </summary>
    private async Task<int> ConsecutiveFailuresAsync(PairConfig pair, RunRecord run, CancellationToken cancellationToken)
    {
        var lookback = Math.Max(1, config.Alerting.CheckFailingAfter) + 1;
        var recent = await history.GetRunsAsync(pair.Name, lookback, includePoints: false, cancellationToken, before: run.StartedAt.AddMilliseconds(1));
        return recent.Where(r => r.Id <= run.Id).TakeWhile(r => r.Status is RunStatus.Failed or RunStatus.Unmeasurable).Count();
    }
}
