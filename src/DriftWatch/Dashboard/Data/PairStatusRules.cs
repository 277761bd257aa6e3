using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;

namespace DriftWatch.Dashboard.Data;

/// <summary>Derives a pair's <see cref="PairStatus"/> from its latest run, its open alerts and whether it has a baseline.</summary>
internal static class PairStatusRules
{
    /// <summary>
    /// A failed or unmeasurable latest check comes first among the facts (what the pair shows now is stale), then firing,
    /// then pending. Info alerts stay pending for ever by design (dashboard only), so they do not make a pair
    /// pending. A pair without a baseline can still fire on its own profile (perfect_relationship, outliers).
    /// </summary>
    public static PairStatus Derive(RunRecord? latest, IReadOnlyCollection<AlertState> openAlerts, bool hasBaseline)
    {
        ArgumentNullException.ThrowIfNull(openAlerts);
        if (latest is null)
        {
            return openAlerts.Any(a => a.Status == AlertStatus.Firing) ? PairStatus.Firing : PairStatus.NoRuns;
        }

        if (latest.Status == RunStatus.Failed)
        {
            return PairStatus.Failing;
        }

        if (latest.Status == RunStatus.Unmeasurable)
        {
            return PairStatus.Unmeasurable;
        }

        var serious = openAlerts.Where(a => a.IsOpen && a.Severity >= Severity.Warning).ToArray();
        if (serious.Any(a => a.Status == AlertStatus.Firing))
        {
            return PairStatus.Firing;
        }

        if (serious.Length > 0)
        {
            return PairStatus.Pending;
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
