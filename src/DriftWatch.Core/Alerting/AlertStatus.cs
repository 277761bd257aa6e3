namespace DriftWatch.Core.Alerting;

/// <summary>Where one (pair, finding kind) alert stands. Serialised lower-case.</summary>
public enum AlertStatus
{
    /// <summary>Seen, not yet persistent enough to notify (info findings stay here: dashboard only).</summary>
    Pending,

    /// <summary>Persistent: notified, or would have been had the pair not been snoozed.</summary>
    Firing,

    /// <summary>A clean run for that kind closed it; a new occurrence opens a new alert.</summary>
    Resolved,
}
