using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Output;

namespace DriftWatch.Dashboard.Data;

/// <summary>
/// The overview's "worst first": the most severe open alert (info sightings are not alerts and do not count),
/// then its state (confirmed before watching), then the latest run's worst finding, then the pair's status, then
/// the name. A confirmed critical (check_failing included) therefore ranks above any warning, whatever the status
/// word says.
/// </summary>
internal static class OverviewRanking
{
    public static IReadOnlyList<PairSummary> Order(IEnumerable<PairSummary> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        return [.. rows
            .OrderByDescending(r => WorstAlert(r)?.Severity is { } s ? (int)s : -1)
            .ThenBy(r => WorstAlert(r) is { } a ? AlertListing.StateRank(a.Status) : int.MaxValue)
            .ThenByDescending(r => r.Latest?.WorstSeverity is { } s ? (int)s : -1)
            .ThenBy(r => r.Status)
            .ThenBy(r => r.Name, StringComparer.Ordinal)];
    }

    /// <summary>The open alert that ranks the pair: highest severity, confirmed before watching.</summary>
    private static AlertState? WorstAlert(PairSummary row) => row.OpenAlerts
        .Where(a => a.IsOpen && a.Severity > Severity.Info)
        .OrderByDescending(a => a.Severity)
        .ThenBy(a => AlertListing.StateRank(a.Status))
        .FirstOrDefault();
}
