namespace DriftWatch.Core.Alerting;

/// <summary>
/// What one alerting cycle decided: every alert state that changed or is new (new ones have Id 0), and the
/// notifications to put in the outbox. A notification's <see cref="AlertNotification.Alert"/> is the same
/// instance as its entry in <see cref="Changes"/>, so the store can map new ids onto it.
/// </summary>
public sealed record CycleDecision(
    DateTimeOffset At,
    IReadOnlyList<AlertState> Changes,
    IReadOnlyList<AlertNotification> Notifications)
{
    public static CycleDecision Empty(DateTimeOffset at) => new(at, [], []);
}
