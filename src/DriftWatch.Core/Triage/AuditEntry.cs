namespace DriftWatch.Core.Triage;

/// <summary>
/// One recorded decision: who (Actor, Via: a name and "dashboard" or "cli"), when, what, on which pair, alert or run,
/// why (<see cref="Reason"/>, as typed) and what came of it (<see cref="Detail"/>, e.g. "until 2026-12-03 08:00 UTC").
/// <see cref="Id"/> is 0 until stored.
/// </summary>
public sealed record AuditEntry(
    long Id,
    DateTimeOffset At,
    string Actor,
    string Via,
    AuditAction Action,
    string? Pair,
    long? AlertId,
    long? RunId,
    string? Reason,
    string? Detail);
