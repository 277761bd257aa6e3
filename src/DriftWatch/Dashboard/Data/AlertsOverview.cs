using DriftWatch.Alerts;
using DriftWatch.Core.Alerting;

namespace DriftWatch.Dashboard.Data;

/// <summary>
/// The alerts page: open alerts, those resolved since <see cref="ResolvedSince"/>, and the outbox (delivery
/// attempts). The store does not link an outbox message to the alerts it announced, so deliveries are listed
/// on their own, by route and subject.
/// </summary>
internal sealed record AlertsOverview(
    IReadOnlyList<AlertState> Open,
    IReadOnlyList<AlertState> Resolved,
    DateTimeOffset ResolvedSince,
    IReadOnlyList<OutboxEntry> Deliveries);
