using DriftWatch.Core.Alerting;

namespace DriftWatch.Alerting.Digest;

/// <summary>
/// "DriftWatch · orders_vs_refunds: slope changed (critical)": the pair and what changed lead, of the worst alert
/// in the digest, then its severity (and whether it is an escalation or a reminder). Further alerts in the same
/// digest follow as "+2 more". An all-clear leads only when nothing in the digest is active:
/// "DriftWatch · orders_vs_refunds: slope changed (cleared)".
/// </summary>
internal static class DigestSubject
{
    public const string Prefix = "DriftWatch ·";

    public static string For(IReadOnlyList<DigestItem> items)
    {
        ArgumentOutOfRangeException.ThrowIfZero(items.Count);
        var lead = DigestOrder.Sort(items)[0];
        var more = items.Count > 1 ? $" +{items.Count - 1} more" : "";
        return $"{Prefix} {lead.Alert.Pair}: {AlertWording.Headline(lead.Alert.Kind)} ({State(lead)}){more}";
    }

    private static string State(DigestItem item)
    {
        var severity = Output.JsonContract.Name(item.Alert.Severity);
        return item.Notification.Kind switch
        {
            NotificationKind.Cleared => "cleared",
            NotificationKind.Escalated => severity + ", escalated",
            NotificationKind.Reminder => severity + ", reminder",
            _ => severity,
        };
    }
}

/// <summary>The order a digest lists things in: worst first, news before reminders, all-clears last.</summary>
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
        NotificationKind.Confirmed => 1,
        NotificationKind.Reminder => 2,
        _ => 3,
    };
}
