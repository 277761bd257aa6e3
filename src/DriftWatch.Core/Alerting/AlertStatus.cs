namespace DriftWatch.Core.Alerting;

/// <summary>Where one (pair, finding kind) alert stands. Serialised lower-case.</summary>
public enum AlertStatus
{
    /// <summary>Seen, not yet confirmed by enough runs in a row to tell anyone (info findings stay here: dashboard only).</summary>
    Watching,

    /// <summary>Confirmed by enough runs in a row: people were told, or would have been had the pair not been snoozed.</summary>
    Confirmed,

    /// <summary>A check showed the finding gone and closed the alert; a new occurrence opens a new alert.</summary>
    Cleared,
}
