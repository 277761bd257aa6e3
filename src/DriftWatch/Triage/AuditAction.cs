namespace DriftWatch.Triage;

/// <summary>What a person did; stored in snake_case (<c>baseline_accept</c>).</summary>
internal enum AuditAction
{
    Ack,
    Snooze,
    Unsnooze,
    BaselineAccept,
    BaselineReset,
}
