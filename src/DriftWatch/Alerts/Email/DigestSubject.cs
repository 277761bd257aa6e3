using DriftWatch.Core.Alerting;

namespace DriftWatch.Alerts.Email;

/// <summary>
/// "[DriftWatch] CRITICAL: 2 alerts — weighed_vs_declared became perfect": the worst severity among the
/// active alerts, how many there are, and the worst one in words. A digest of recoveries only reads
/// "[DriftWatch] RESOLVED: 1 alert cleared — …".
/// </summary>
internal static class DigestSubject
{
    public const string Prefix = "[DriftWatch]";

    public static string For(IReadOnlyList<DigestItem> items)
    {
        ArgumentOutOfRangeException.ThrowIfZero(items.Count);
        var active = DigestOrder.Sort(items.Where(i => i.IsActive));
        var resolved = items.Count(i => !i.IsActive);
        if (active.Count == 0)
        {
            var first = DigestOrder.Sort(items)[0];
            return $"{Prefix} RESOLVED: {Alerts(resolved)} cleared — {first.Alert.Pair} {AlertWording.Phrase(first.Alert.Kind)}";
        }

        var worst = active[0];
        var tail = resolved > 0 ? $", {resolved} resolved" : "";
        return $"{Prefix} {AlertWording.SeverityLabel(worst.Alert.Severity)}: {Alerts(active.Count)}{tail} — {worst.Alert.Pair} {AlertWording.Phrase(worst.Alert.Kind)}";
    }

    private static string Alerts(int n) => n == 1 ? "1 alert" : $"{n} alerts";
}

/// <summary>The order a digest lists things in: worst first, news before reminders, recoveries last.</summary>
internal static class DigestOrder
{
    public static IReadOnlyList<DigestItem> Sort(IEnumerable<DigestItem> items) =>
    [
        .. items
            .OrderBy(i => i.IsActive ? 0 : 1)
            .ThenByDescending(i => i.Alert.Severity)
            .ThenBy(i => Rank(i.Notification.Kind))
            .ThenBy(i => i.Alert.Pair, StringComparer.Ordinal)
            .ThenBy(i => i.Alert.Kind),
    ];

    private static int Rank(NotificationKind kind) => kind switch
    {
        NotificationKind.Escalated => 0,
        NotificationKind.Fired => 1,
        NotificationKind.Renotified => 2,
        _ => 3,
    };
}
