namespace DriftWatch.Core.Alerting;

/// <summary>Why an alert goes into this cycle's digest. Serialised lower-case.</summary>
public enum NotificationKind
{
    /// <summary>It became firing (or a snooze ended on a firing alert nobody was told about).</summary>
    Fired,

    /// <summary>A firing alert got worse (warning to critical).</summary>
    Escalated,

    /// <summary>Still firing after the re-notify interval, not acknowledged.</summary>
    Renotified,

    /// <summary>A clean run closed a notified alert: the recovery notice.</summary>
    Resolved,
}
