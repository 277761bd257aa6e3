using System.Data.Common;
using DriftWatch.Alerting.Digest;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Alerting.Evaluation;

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
    ILogger<AlertEvaluation> logger,
    Hosting.LiveConfig? live = null) : IDisposable
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
                    // The watermark moves in the transaction that stores the cycle's decision (or alone when the
                    // cycle had nothing to decide): a crash before that commit re-reads the cycle, after it never.
                    var result = await EvaluateCycleAsync(cycle, cancellationToken);
                    if (result is not null)
                    {
                        results.Add(result);
                    }

                    watermark = cycle[^1].Id;
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
        var unreadable = 0;
        foreach (var (id, pairName) in cycle)
        {
            // The configuration in force (a reload may have added or removed pairs since the start).
            var pair = (live?.Current ?? config).FindPair(pairName);
            if (pair is null)
            {
                // A pair removed from the configuration: its old runs no longer alert anyone.
                continue;
            }

            try
            {
                if (await ReadRunAsync(pair, id, cancellationToken) is { } read)
                {
                    outcomes.Add(read.Outcome);
                    contexts[pair.Name] = read.Context;
                }
            }
            catch (Exception ex) when (IsUnreadable(ex))
            {
                // Per run: one run that cannot be read is passed over (counted in worker_state and logged) and the
                // other pairs of the cycle are still judged. Its pair's streaks go on as if the run had not happened.
                unreadable++;
                logger.LogWarning(ex, "Run {RunId} of {Pair} cannot be read for alerting and is passed over: {Reason}", id, pair.Name, ex.Message);
            }
        }

        var position = new FeedPosition(RunFeed.AlertsWatermarkKey, cycle[^1].Id, unreadable);
        if (outcomes.Count == 0)
        {
            await feed.AdvanceAsync(position, cancellationToken);
            return null;
        }

        var result = await processor.ProcessAsync(outcomes, contexts, position, cancellationToken);
        if (result.Queued.Count > 0)
        {
            logger.LogInformation("Alert cycle over {Runs} runs queued {Messages} messages", outcomes.Count, result.Queued.Count);
        }

        return result;
    }

    /// <summary>
    /// A run whose stored data cannot be turned back into an outcome (a profile or figures that do not parse, an
    /// unknown status), as opposed to a store that cannot be reached: that ends the evaluation, and the next one
    /// starts again from the watermark.
    /// </summary>
    private static bool IsUnreadable(Exception ex) =>
        ex is not (OperationCanceledException or DbException or IOException or TimeoutException or System.Net.Sockets.SocketException);

    private async Task<(PairOutcome Outcome, AlertPairContext Context)?> ReadRunAsync(PairConfig pair, long id, CancellationToken cancellationToken)
    {
        var run = await history.GetRunAsync(id, includePoints: true, cancellationToken);
        if (run is null)
        {
            return null;
        }

        PairOutcome outcome;
        if (run.Status == RunStatus.Succeeded)
        {
            outcome = PairOutcome.Success(pair.Name, run.Id, run.Findings);
        }
        else if (run.Status == RunStatus.Unmeasurable)
        {
            // Nothing was learnt about the relationship: counts toward check_failing, clears nothing.
            var failures = await ConsecutiveFailuresAsync(pair, run, cancellationToken);
            outcome = PairOutcome.Unmeasurable(pair.Name, run.Id, failures, run.Error ?? "no reason was recorded");
        }
        else
        {
            var failures = await ConsecutiveFailuresAsync(pair, run, cancellationToken);
            outcome = PairOutcome.Failure(pair.Name, run.Id, failures, run.Error ?? "the check failed");
        }

        var baseline = await ReadBaselineAsync(pair, cancellationToken);
        var context = new AlertPairContext(pair, run.Profile, run.Points, baseline?.Profile, baseline?.Points)
        {
            Window = run.SourceFigures,
            JudgedAgainst = run.JudgedAgainst,
        };
        return (outcome, context);
    }

    /// <summary>The baseline only illustrates the digest: one that cannot be read leaves the plot without it, not the alert.</summary>
    private async Task<StoredBaseline?> ReadBaselineAsync(PairConfig pair, CancellationToken cancellationToken)
    {
        try
        {
            return await history.GetBaselineAsync(pair.Name, cancellationToken);
        }
        catch (Exception ex) when (IsUnreadable(ex))
        {
            logger.LogWarning(ex, "The baseline of {Pair} cannot be read; its alert digest shows the run alone: {Reason}", pair.Name, ex.Message);
            return null;
        }
    }

    /// <summary>
    /// Failed or unmeasurable runs in a row ending with <paramref name="run"/>, counted from the history (enough to
    /// decide check_failing): a pair whose window is empty day after day is as unwatched as one that cannot be read.
    /// </summary>
    private async Task<int> ConsecutiveFailuresAsync(PairConfig pair, RunRecord run, CancellationToken cancellationToken)
    {
        var lookback = Math.Max(1, config.Alerting.CheckFailingAfter) + 1;
        var recent = await history.GetRunsAsync(pair.Name, lookback, includePoints: false, cancellationToken, before: run.StartedAt.AddMilliseconds(1));
        // Back-dated runs (check --as-of) are history, not the pair's current streak.
        return recent.Where(r => r.Id <= run.Id && r.BackDatedAt is null).TakeWhile(r => r.Status is RunStatus.Failed or RunStatus.Unmeasurable or RunStatus.Interrupted).Count();
    }
}
