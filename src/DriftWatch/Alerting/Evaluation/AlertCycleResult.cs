using DriftWatch.Core.Alerting;

namespace DriftWatch.Alerting.Evaluation;

/// <summary>What one alerting cycle stored: the alert states (with ids) and the messages it queued.</summary>
internal sealed record AlertCycleResult(CycleDecision Decision, IReadOnlyList<AlertState> Saved, IReadOnlyList<OutboxMessage> Queued);
