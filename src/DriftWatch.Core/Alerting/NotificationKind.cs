namespace DriftWatch.Core.Alerting;

/// <summary>Why an alert goes into this cycle's digest. Serialised lower-case.</summary>
public enum NotificationKind
{
    /// <summary>It became confirmed (or a snooze ended on a confirmed alert nobody was told about).</summary>
    Confirmed,

    /// <summary>A confirmed alert got worse (warning to critical).</summary>
    Escalated,

    /// <summary>Still confirmed, not acknowledged, and the last notice is at least the reminder interval old.</summary>
    Reminder,

    /// <summary>A check showed a notified alert's finding gone: the all-clear notice.</summary>
    Cleared,
}
