using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Baselines;

/// <summary>
/// Pools the stored points of several runs into one bounded, deterministic reservoir and profiles it.
/// The profiler is passed in so this stays independent of how profiles are computed.
/// </summary>
public static class BaselineBuilder
{
    /// <summary>Points a baseline keeps at most: enough for a stable profile and a KS test, small enough to store.</summary>
    public const int DefaultCapacity = 5000;

    /// <summary>
    /// Builds a baseline from <paramref name="runs"/> (any order; pooled oldest first). Runs without points
    /// (failed, or pruned) are skipped. Returns null when no run contributes a point.
    /// </summary>
    /// <remarks>
    /// The pooled sample carries null, non-finite and non-numeric counts scaled to its size, so the
    /// baseline's drop rates equal those of the pooled runs (the stored points are usable rows only).
    /// The profile's figures come from the pooled points, but its row counts (n_rows, n_used, n_null,
    /// n_nonfinite, n_non_numeric) are the pooled runs' means: a check compares its own run with a typical
    /// run, so a pool of five small runs does not make every new run look "shrunk", and tests that weigh the
    /// baseline by its n stay conservative instead of crediting it with several runs' worth of rows.
    /// The reservoir seed derives from the pair's name: the same runs always give the same baseline.
    /// </remarks>
    public static StoredBaseline? Build(
        string pair,
        BaselinePolicy policy,
        IReadOnlyList<RunRecord> runs,
        DateTimeOffset now,
        Func<PairedSample, RelationshipProfile> profiler,
        bool accepted = false,
        int capacity = DefaultCapacity,
        Thresholds? thresholds = null)
    {
        ArgumentException.ThrowIfNullOrEmpty(pair);
        ArgumentNullException.ThrowIfNull(policy);
        ArgumentNullException.ThrowIfNull(runs);
        ArgumentNullException.ThrowIfNull(profiler);

        var pooled = runs
            .Where(r => r.Status == RunStatus.Succeeded && r.Points is { UsedCount: > 0 })
            .OrderBy(r => r.StartedAt)
            .ThenBy(r => r.Id)
            .ToList();
        if (pooled.Count == 0)
        {
            return null;
        }

        var reservoir = new PointReservoir(capacity, StableSeed.FromName(pair));
        long rows = 0, used = 0, nulls = 0, nonFinite = 0, nonNumeric = 0;
        foreach (var run in pooled)
        {
            reservoir.AddRange(run.Points!);
            var counts = RunCounts.Of(run);
            rows += counts.Rows;
            used += counts.Used;
            nulls += counts.Null;
            nonFinite += counts.NonFinite;
            nonNumeric += counts.NonNumeric;
        }

        var scale = used == 0 ? 0.0 : reservoir.Count / (double)used;
        var sample = reservoir.ToSample(Scaled(nulls, scale), Scaled(nonFinite, scale), Scaled(nonNumeric, scale));
        var runCount = (double)pooled.Count;
        var profile = profiler(sample) with
        {
            NRows = Mean(rows, runCount),
            NUsed = Mean(used, runCount),
            NNull = Mean(nulls, runCount),
            NNonfinite = Mean(nonFinite, runCount),
            NNonNumeric = Mean(nonNumeric, runCount),
        };
        var figures = pooled
            .Where(r => r.Profile is not null)
            .Select(r => RunFigures.Of(r.Id, r.StartedAt, r.Profile!, r.SourceFigures, thresholds ?? Thresholds.Default))
            .ToList();
        return new StoredBaseline(
            pair,
            policy.Kind,
            policy.ToString(),
            now,
            pooled[0].StartedAt,
            pooled[^1].StartedAt,
            pooled.Count,
            profile,
            sample,
            accepted,
            used / (double)pooled.Count)
        {
            Runs = figures,
        };
    }

    private static int Mean(long total, double count) => (int)Math.Round(total / count, MidpointRounding.AwayFromZero);

    private static int Scaled(long count, double scale) => (int)Math.Round(count * scale, MidpointRounding.AwayFromZero);

    /// <summary>A run's own counts: from its profile (the full sample) when present, else from its stored points.</summary>
    private readonly record struct RunCounts(long Rows, long Used, long Null, long NonFinite, long NonNumeric)
    {
        public static RunCounts Of(RunRecord run) => run.Profile is { } p
            ? new RunCounts(p.NRows, p.NUsed, p.NNull, p.NNonfinite, p.NNonNumeric)
            : new RunCounts(run.Points!.RowCount, run.Points.UsedCount, run.Points.NullCount, run.Points.NonFiniteCount, run.Points.NonNumericCount);
    }
}
