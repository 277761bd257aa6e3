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
/// The profiler is passed in (the statistics engine's <c>Profiler.Profile</c>).
/// </summary>
internal sealed class BaselineService(
    IHistoryStore store,
    Func<PairedSample, Thresholds, RelationshipProfile> profiler,
    ILogger<BaselineService>? logger = null)
{
    /// <summary>How many recent runs <see cref="AcceptLatestAsync"/> looks through for one with points.</summary>
    public const int AcceptLookback = 20;

    private readonly ILogger _logger = logger ?? NullLogger<BaselineService>.Instance;

    /// <summary>The baseline to compare a check at <paramref name="now"/> with; null while there is none yet (first_runs warming up).</summary>
    public async Task<StoredBaseline?> GetOrBuildAsync(PairConfig pair, DateTimeOffset now, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        var existing = await store.GetBaselineAsync(pair.Name, cancellationToken);
        var plan = BaselinePolicySelector.Plan(pair.Baseline, existing, now);
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

        await store.SaveBaselineAsync(baseline, cancellationToken);
        _logger.LogInformation("Baseline of {Pair} accepted from the run started {StartedAt:o}", pair.Name, baseline.CoversFrom);
        return baseline;
    }

    /// <summary>
    /// Forgets the pair's baseline; the next check rebuilds it by the policy from the runs still in the store
    /// (first_runs: the first N retained runs). True when there was one.
    /// </summary>
    public async Task<bool> ResetAsync(string pair, CancellationToken cancellationToken)
    {
        var deleted = await store.DeleteBaselineAsync(pair, cancellationToken);
        if (deleted)
        {
            _logger.LogInformation("Baseline of {Pair} reset", pair);
        }

        return deleted;
    }

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
