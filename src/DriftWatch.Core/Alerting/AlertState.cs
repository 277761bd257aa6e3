using DriftWatch.Core.Findings;

namespace DriftWatch.Core.Alerting;

/// <summary>
/// The stored state of one alert: one (pair, kind) from its first sighting until a check shows it gone.
/// At most one open (watching or confirmed) alert exists per (pair, kind). <paramref name="Id"/> is 0 until the
/// store has written it. <paramref name="ConsecutiveRuns"/> counts the runs in a row that carried the kind
/// (for check_failing: the failed checks in a row).
/// </summary>
public sealed record AlertState(
    long Id,
    string Pair,
    FindingKind Kind,
    Severity Severity,
    AlertStatus Status,
    int ConsecutiveRuns,
    DateTimeOffset FirstSeen,
    DateTimeOffset LastSeen,
    DateTimeOffset? ConfirmedAt,
    DateTimeOffset? LastNotifiedAt,
    DateTimeOffset? ClearedAt,
    DateTimeOffset? AckedAt,
    string Message,
    long? LastRunId)
{
    public bool IsOpen => Status != AlertStatus.Cleared;

    public bool IsAcked => AckedAt is not null;
}
