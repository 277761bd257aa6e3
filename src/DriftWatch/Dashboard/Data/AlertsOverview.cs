using DriftWatch.Core.Alerting;

namespace DriftWatch.Dashboard.Data;

/// <summary>
/// The alerts page: open alerts, those cleared since <see cref="ClearedSince"/>, and the outbox (delivery
/// attempts). The store does not link an outbox message to the alerts it announced, so deliveries are listed
/// on their own, by mailing list and subject.
/// </summary>
internal sealed record AlertsOverview(
    IReadOnlyList<AlertState> Open,
    IReadOnlyList<AlertState> Cleared,
    DateTimeOffset ClearedSince,
    IReadOnlyList<OutboxEntry> Deliveries);
