using DriftWatch.Core.Alerting;
using DriftWatch.Core.Triage;
using DriftWatch.Triage;

namespace DriftWatch.Dashboard.Data;

/// <summary>
/// What the pair page's triage section shows: the pair's audit log, its snooze and pending baseline reset, and
/// whether this visitor may act (<see cref="CsrfToken"/> set: a live session) and under which name
/// (<see cref="ActorName"/>; null: the forms ask for one). <see cref="Configured"/> is false for a pair that is
/// only in the store: its audit log is shown, but there is nothing to act on.
/// </summary>
internal sealed record TriagePanel(
    IReadOnlyList<AuditEntry> Audit,
    PairSnooze? Snooze,
    DateTimeOffset? BaselineResetAt,
    string? CsrfToken,
    string? ActorName,
    bool NameFromProxy,
    bool Configured)
{
    /// <summary>How many audit entries the pair page lists.</summary>
    public const int AuditRows = 50;

    public bool SignedIn => CsrfToken is not null;
}
