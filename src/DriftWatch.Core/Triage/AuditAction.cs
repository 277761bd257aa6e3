namespace DriftWatch.Core.Triage;

/// <summary>What a person did; stored in snake_case (<c>baseline_accept</c>).</summary>
public enum AuditAction
{
    Ack,
    Snooze,
    Unsnooze,
    BaselineAccept,
    BaselineReset,
}
