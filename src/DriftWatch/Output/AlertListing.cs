using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;

namespace DriftWatch.Output;

/// <summary>
/// Which stored alerts a list shows, and in which order: the same for <c>alerts list</c> (table and JSON) and the
/// dashboard's alerts page, so a script and a person see the same sequence.
/// </summary>
internal static class AlertListing
{
    /// <summary>
    /// Drops info sightings: the lifecycle keeps them in the store for the dashboard's pair pages, but they never
    /// notify anyone and are not alerts. Then orders open before cleared, by severity (critical first), state
    /// (confirmed before watching), first seen (newest first) and id (highest first): a total order, so the list
    /// never reshuffles between two calls on the same store.
    /// </summary>
    public static IReadOnlyList<AlertState> Arrange(IEnumerable<AlertState> alerts)
    {
        ArgumentNullException.ThrowIfNull(alerts);
        return [.. alerts
            .Where(a => a.Severity > Severity.Info)
            .OrderBy(a => a.IsOpen ? 0 : 1)
            .ThenByDescending(a => a.Severity)
            .ThenBy(a => StateRank(a.Status))
            .ThenByDescending(a => a.FirstSeen)
            .ThenByDescending(a => a.Id)];
    }

    /// <summary>Confirmed before watching before cleared: what needs a person comes first.</summary>
    public static int StateRank(AlertStatus status) => status switch
    {
        AlertStatus.Confirmed => 0,
        AlertStatus.Watching => 1,
        _ => 2,
    };
}
