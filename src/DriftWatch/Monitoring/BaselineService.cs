using DriftWatch.Core.Baselines;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;
using Microsoft.Extensions.Logging.Abstractions;

namespace DriftWatch.Monitoring;

/// <summary>
/// Keeps each pair's baseline as its policy says: loads the stored one, rebuilds it from stored runs when the
/// policy calls for it, and serves the <c>baseline accept</c> and <c>baseline reset</c> commands.
/// The profiler is passed in (the statistics engine's <c>Profiler.Profile</c>). Without a
/// <paramref name="resets"/> store a reset only forgets the baseline (the next build may pool old runs).
/// </summary>
internal sealed class BaselineService(
    IHistoryStore store,
    Func<PairedSample, Thresholds, RelationshipProfile> profiler,
    ILogger<BaselineService>? logger = null,
    IBaselineResetStore? resets = null)
{
    /// <summary>How many recent runs <see cref="AcceptLatestAsync"/> looks through for one with points.</summary>
    public const int AcceptLookback = 20;

    private readonly ILogger _logger = logger ?? NullLogger<BaselineService>.Instance;

    /// <summary>The baseline to compare a check at <paramref name="now"/> with; null while there is none yet (first_runs warming up).</summary>
    public async Task<StoredBaseline?> GetOrBuildAsync(PairConfig pair, DateTimeOffset now, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        var existing = await store.GetBaselineAsync(pair.Name, cancellationToken);
        // Read at every check, not only without a baseline: a rolling or window rebuild after a reset must not reach back past it either.
        var resetAt = resets is null ? null : await resets.GetResetAsync(pair.Name, cancellationToken);
        var plan = BaselinePolicySelector.Plan(pair.Baseline, existing, now, resetAt);
        if (plan.Kind == BaselinePlanKind.KeepExisting)
        {
            return existing;
        }

        var runs = await LoadRunsAsync(pair.Name, plan, cancellationToken);
        var baseline = BaselinePolicySelector.Build(pair.Name, pair.Baseline, plan, runs, existing, now, s => profiler(s, pair.Thresholds), pair.Thresholds);
        if (baseline is not null && !ReferenceEquals(baseline, existing))
        {
            await store.SaveBaselineAsync(baseline, cancellationToken);
            _logger.LogInformation(
                "Baseline of {Pair} built from {RunCount} runs ({CoversFrom:o} to {CoversTo:o}): {Reason}",
                pair.Name, baseline.RunCount, baseline.CoversFrom, baseline.CoversTo, plan.Reason);
        }

        return baseline;
    }

    /// <summary>The latest successful run that still has its points: what <c>baseline accept</c> adopts without <c>--run</c>.</summary>
    public async Task<RunRecord?> LatestAcceptableRunAsync(string pair, CancellationToken cancellationToken)
    {
        var recent = await store.GetRunsAsync(pair, AcceptLookback, includePoints: true, cancellationToken);
        return recent
            .Where(r => r.Status == RunStatus.Succeeded && r.Points is { UsedCount: > 0 })
            .OrderByDescending(r => r.StartedAt)
            .ThenByDescending(r => r.Id)
            .FirstOrDefault();
    }

    /// <summary>Adopts the latest successful run (with points) as the pair's baseline; null when there is none.</summary>
    public async Task<StoredBaseline?> AcceptLatestAsync(PairConfig pair, DateTimeOffset now, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        var recent = await store.GetRunsAsync(pair.Name, AcceptLookback, includePoints: true, cancellationToken);
        var baseline = BaselinePolicySelector.Accept(pair.Name, pair.Baseline, recent, now, s => profiler(s, pair.Thresholds), pair.Thresholds);
        if (baseline is null)
        {
            return null;
        }

        await SaveAcceptedAsync(baseline, cancellationToken);
        return baseline;
    }

    /// <summary>Adopts one chosen run (with points) as the pair's baseline; null when it cannot be pooled.</summary>
    public async Task<StoredBaseline?> AcceptRunAsync(PairConfig pair, RunRecord run, DateTimeOffset now, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        ArgumentNullException.ThrowIfNull(run);
        if (run.Pair != pair.Name)
        {
            throw new ArgumentException($"run {run.Id} belongs to '{run.Pair}', not '{pair.Name}'", nameof(run));
        }

        var baseline = BaselinePolicySelector.AcceptRun(pair.Name, pair.Baseline, run, now, s => profiler(s, pair.Thresholds), pair.Thresholds);
        if (baseline is not null)
        {
            await SaveAcceptedAsync(baseline, cancellationToken);
        }

        return baseline;
    }

    private async Task SaveAcceptedAsync(StoredBaseline baseline, CancellationToken cancellationToken)
    {
        await store.SaveBaselineAsync(baseline, cancellationToken);
        if (resets is not null)
        {
            // The accepted run is the anchor now; an earlier reset must not keep it out of a rolling rebuild.
            await resets.ClearResetAsync(baseline.Pair, cancellationToken);
        }

        _logger.LogInformation("Baseline of {Pair} accepted from the run started {StartedAt:o}", baseline.Pair, baseline.CoversFrom);
    }

    /// <summary>
    /// Forgets the pair's baseline. With a reset store, the next baseline is pooled by the policy only from runs
    /// started at or after <paramref name="now"/> (first_runs: the next N runs), never from the runs stored
    /// before, which describe what was reset. True when there was a baseline.
    /// </summary>
    public async Task<bool> ResetAsync(string pair, DateTimeOffset now, CancellationToken cancellationToken)
    {
        if (resets is not null)
        {
            await resets.SetResetAsync(pair, now, cancellationToken);
        }

        var deleted = await store.DeleteBaselineAsync(pair, cancellationToken);
        _logger.LogInformation("Baseline of {Pair} reset at {ResetAt:o} (had one: {Deleted})", pair, now, deleted);
        return deleted;
    }

    /// <summary>When the pair's baseline was last reset and not since accepted; null without a reset store.</summary>
    public Task<DateTimeOffset?> GetResetAsync(string pair, CancellationToken cancellationToken) =>
        resets is null ? Task.FromResult<DateTimeOffset?>(null) : resets.GetResetAsync(pair, cancellationToken);

    /// <summary>
    /// The runs a plan names. With a limit (first_runs) it pages on until enough runs with points are found,
    /// since runs whose points were pruned cannot be pooled.
    /// </summary>
    private async Task<IReadOnlyList<RunRecord>> LoadRunsAsync(string pair, BaselinePlan plan, CancellationToken cancellationToken)
    {
        var collected = new List<RunRecord>();
        var from = plan.From;
        while (true)
        {
            var batch = await store.GetSuccessfulRunsAsync(pair, from, plan.To, plan.Limit, cancellationToken);
            collected.AddRange(batch);
            if (plan.Limit is not { } limit || batch.Count < limit || BaselinePolicySelector.SelectRuns(plan, collected).Count >= limit)
            {
                return collected;
            }

            from = batch[^1].StartedAt.AddMilliseconds(1);
        }
    }
}
