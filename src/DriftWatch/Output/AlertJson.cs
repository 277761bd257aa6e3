using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;

namespace DriftWatch.Output;

/// <summary>
/// One alert state, as every outward surface shows it: <c>alerts list --format json</c> and the dashboard's
/// <c>/api/alerts</c>. Kind, severity and status are snake_case strings by <see cref="JsonContract"/>'s one enum
/// naming. Add fields at the end.
/// </summary>
internal sealed record AlertJson(
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
    public static AlertJson Of(AlertState alert)
    {
        ArgumentNullException.ThrowIfNull(alert);
        return new AlertJson(
            alert.Id, alert.Pair, alert.Kind, alert.Severity, alert.Status, alert.ConsecutiveRuns, alert.FirstSeen, alert.LastSeen,
            alert.ConfirmedAt, alert.LastNotifiedAt, alert.ClearedAt, alert.AckedAt, alert.Message, alert.LastRunId);
    }
}

/// <summary>A pair's snooze (<c>alerts list --format json</c>).</summary>
internal sealed record SnoozeJson(string Pair, DateTimeOffset Until, string? Reason)
{
    public static SnoozeJson Of(PairSnooze snooze)
    {
        ArgumentNullException.ThrowIfNull(snooze);
        return new SnoozeJson(snooze.Pair, snooze.Until, snooze.Reason);
    }
}
