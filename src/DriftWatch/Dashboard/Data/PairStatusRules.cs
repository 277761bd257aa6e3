using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;

namespace DriftWatch.Dashboard.Data;

/// <summary>Derives a pair's <see cref="PairStatus"/> from its latest run, its open alerts and whether it has a baseline.</summary>
internal static class PairStatusRules
{
    /// <summary>
    /// A failed or unmeasurable latest check comes first among the facts (what the pair shows now is stale), then confirmed,
    /// then watching. Info alerts stay watching for ever by design (dashboard only), so they do not make a pair
    /// watching. A pair without a baseline can still have an alert confirmed on its own profile (perfect_relationship, outliers).
    /// </summary>
    public static PairStatus Derive(RunRecord? latest, IReadOnlyCollection<AlertState> openAlerts, bool hasBaseline)
    {
        ArgumentNullException.ThrowIfNull(openAlerts);
        if (latest is null)
        {
            return openAlerts.Any(a => a.Status == AlertStatus.Confirmed) ? PairStatus.Confirmed : PairStatus.NoRuns;
        }

        // A check cut off by a crash or a stop says nothing about the pair, only that it went unchecked: failing.
        if (latest.Status is RunStatus.Failed or RunStatus.Interrupted)
        {
            return PairStatus.Failing;
        }

        if (latest.Status == RunStatus.Unmeasurable)
        {
            return PairStatus.Unmeasurable;
        }

        var serious = openAlerts.Where(a => a.IsOpen && a.Severity >= Severity.Warning).ToArray();
        if (serious.Any(a => a.Status == AlertStatus.Confirmed))
        {
            return PairStatus.Confirmed;
        }

        if (serious.Length > 0)
        {
            return PairStatus.Watching;
        }

        return hasBaseline ? PairStatus.Healthy : PairStatus.NoBaseline;
    }

    /// <summary>The word the pages and the API show: "no_baseline" in JSON, "no baseline" for people.</summary>
    public static string Label(PairStatus status) => status switch
    {
        PairStatus.NoBaseline => "no baseline",
        PairStatus.NoRuns => "no runs yet",
        _ => Output.JsonContract.Name(status),
    };
}
