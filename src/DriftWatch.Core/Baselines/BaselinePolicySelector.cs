using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Baselines;

/// <summary>
/// Decides, per policy, whether a pair's baseline stands or is rebuilt and from which runs.
/// <list type="bullet">
/// <item>first_runs N: pooled once from the first N successful runs (none until N exist), then fixed.</item>
/// <item>window from..to: pooled from the runs in the window; rebuilt while the window was still open at the last build.</item>
/// <item>rolling P: pooled from the runs in [now − P, now) without critical findings; refreshed every P/30,
///   and at every check while it has fewer than <see cref="RollingMinRuns"/> runs.</item>
/// </list>
/// A changed policy (its text differs from the stored one) always rebuilds. An accepted baseline is fixed
/// under first_runs and window; under rolling it anchors the period's start until the period passes it.
/// After a reset, no policy pools a run started before the reset: the runs stored then describe what was reset.
/// </summary>
public static class BaselinePolicySelector
{
    /// <summary>A rolling baseline is refreshed when older than its period divided by this.</summary>
    public const int RollingRefreshDivisor = 30;

    /// <summary>A rolling baseline pooled from fewer runs than this is rebuilt at every check, so it grows quickly while young.</summary>
    public const int RollingMinRuns = 5;

    /// <param name="resetAt">When the pair's baseline was last reset, if ever: a plan to build pools only runs from then on.</param>
    public static BaselinePlan Plan(BaselinePolicy policy, StoredBaseline? existing, DateTimeOffset now, DateTimeOffset? resetAt = null)
    {
        var plan = PlanIgnoringReset(policy, existing, now);
        if (resetAt is not { } reset || plan.Kind != BaselinePlanKind.Build || plan.From >= reset)
        {
            return plan;
        }

        return plan with { From = reset, Reason = plan.Reason + ", runs since the reset only" };
    }

    private static BaselinePlan PlanIgnoringReset(BaselinePolicy policy, StoredBaseline? existing, DateTimeOffset now)
    {
        ArgumentNullException.ThrowIfNull(policy);
        var policyChanged = existing is not null && existing.PolicyText != policy.ToString();

        // A baseline stored before runs' own figures were kept cannot give the runs' spread: pool it again.
        var withoutRuns = existing is { Accepted: false, Runs.Count: 0 };
        if (policyChanged || withoutRuns)
        {
            existing = null;
        }

        var reasonNew = policyChanged ? "policy changed" : withoutRuns ? "baseline predates per-run figures" : "no baseline yet";
        return policy.Kind switch
        {
            BaselinePolicyKind.FirstRuns => existing is null
                ? new BaselinePlan(BaselinePlanKind.Build, null, null, policy.FirstRuns, policy.FirstRuns, false, false, reasonNew)
                : BaselinePlan.Keep(existing.Accepted ? "accepted" : "first runs pooled"),
            BaselinePolicyKind.Window => PlanWindow(policy, existing, reasonNew),
            _ => PlanRolling(policy, existing, now, reasonNew),
        };
    }

    private static BaselinePlan PlanWindow(BaselinePolicy policy, StoredBaseline? existing, string reasonNew)
    {
        if (existing is null)
        {
            return new BaselinePlan(BaselinePlanKind.Build, policy.From, policy.To, null, 1, false, false, reasonNew);
        }

        if (existing.Accepted)
        {
            return BaselinePlan.Keep("accepted");
        }

        var windowWasOpen = policy.To is null || existing.CreatedAt < policy.To;
        return windowWasOpen
            ? new BaselinePlan(BaselinePlanKind.Build, policy.From, policy.To, null, 1, false, false, "window still open at last build")
            : BaselinePlan.Keep("window closed");
    }

    private static BaselinePlan PlanRolling(BaselinePolicy policy, StoredBaseline? existing, DateTimeOffset now, string reasonNew)
    {
        var from = now - policy.RollingPeriod;
        var accepted = false;
        if (existing is { Accepted: true } && existing.CoversFrom > from)
        {
            // Runs before the accepted one describe the relationship as it was before an intentional change.
            from = existing.CoversFrom;
            accepted = true;
        }

        string reason;
        if (existing is null)
        {
            reason = reasonNew;
        }
        else if (existing.RunCount < RollingMinRuns)
        {
            reason = "young rolling baseline";
        }
        else if (now - existing.CreatedAt >= policy.RollingPeriod / RollingRefreshDivisor)
        {
            reason = "rolling refresh due";
        }
        else
        {
            return BaselinePlan.Keep("rolling baseline fresh");
        }

        return new BaselinePlan(BaselinePlanKind.Build, from, now, null, 1, true, accepted, reason);
    }

    /// <summary>
    /// Carries out a <see cref="BaselinePlanKind.Build"/> plan over the runs loaded for it. Returns the new
    /// baseline, or <paramref name="existing"/> when the plan keeps it or too few runs qualify.
    /// </summary>
    public static StoredBaseline? Build(
        string pair,
        BaselinePolicy policy,
        BaselinePlan plan,
        IReadOnlyList<RunRecord> runs,
        StoredBaseline? existing,
        DateTimeOffset now,
        Func<PairedSample, RelationshipProfile> profiler,
        Thresholds? thresholds = null)
    {
        ArgumentNullException.ThrowIfNull(plan);
        ArgumentNullException.ThrowIfNull(runs);
        if (plan.Kind == BaselinePlanKind.KeepExisting)
        {
            return existing;
        }

        var chosen = SelectRuns(plan, runs);
        if (chosen.Count < plan.RequiredRuns)
        {
            return existing is not null && existing.PolicyText == policy.ToString() ? existing : null;
        }

        return BaselineBuilder.Build(pair, policy, chosen, now, profiler, plan.Accepted, thresholds: thresholds) ?? existing;
    }

    /// <summary>The runs of <paramref name="runs"/> the plan pools, oldest first.</summary>
    public static IReadOnlyList<RunRecord> SelectRuns(BaselinePlan plan, IReadOnlyList<RunRecord> runs)
    {
        ArgumentNullException.ThrowIfNull(plan);
        ArgumentNullException.ThrowIfNull(runs);
        IEnumerable<RunRecord> chosen = runs
            .Where(r => r.Status == RunStatus.Succeeded && r.Points is { UsedCount: > 0 })
            .Where(r => plan.From is null || r.StartedAt >= plan.From)
            .Where(r => plan.To is null || r.StartedAt < plan.To)
            .Where(r => !plan.ExcludeCritical || r.WorstSeverity != Severity.Critical)
            .OrderBy(r => r.StartedAt)
            .ThenBy(r => r.Id);
        if (plan.Limit is { } limit)
        {
            chosen = chosen.Take(limit);
        }

        return [.. chosen];
    }

    /// <summary>
    /// The "accept" operation: after an intentional change, the latest successful run with points becomes
    /// the baseline. Null when no run qualifies.
    /// </summary>
    public static StoredBaseline? Accept(
        string pair,
        BaselinePolicy policy,
        IReadOnlyList<RunRecord> recentRuns,
        DateTimeOffset now,
        Func<PairedSample, RelationshipProfile> profiler,
        Thresholds? thresholds = null)
    {
        ArgumentNullException.ThrowIfNull(recentRuns);
        var latest = recentRuns
            .Where(r => r.Status == RunStatus.Succeeded && r.Points is { UsedCount: > 0 })
            .OrderByDescending(r => r.StartedAt)
            .ThenByDescending(r => r.Id)
            .FirstOrDefault();
        return latest is null ? null : BaselineBuilder.Build(pair, policy, [latest], now, profiler, accepted: true, thresholds: thresholds);
    }

    /// <summary>
    /// The "accept" operation for one chosen run: it becomes the baseline. Null when the run cannot be pooled
    /// (not succeeded, or its points are gone).
    /// </summary>
    public static StoredBaseline? AcceptRun(
        string pair,
        BaselinePolicy policy,
        RunRecord run,
        DateTimeOffset now,
        Func<PairedSample, RelationshipProfile> profiler,
        Thresholds? thresholds = null)
    {
        ArgumentNullException.ThrowIfNull(run);
        return run.Status == RunStatus.Succeeded && run.Points is { UsedCount: > 0 }
            ? BaselineBuilder.Build(pair, policy, [run], now, profiler, accepted: true, thresholds: thresholds)
            : null;
    }
}
