using DriftWatch.Core.Alerting;

namespace DriftWatch.Store;

/// <summary>
/// Alert states and snoozes (what alerting decided); the queue of messages is <see cref="IOutboxStore"/>. One
/// implementation serves SQLite and PostgreSQL.
/// </summary>
internal interface IAlertStore
{
    /// <summary>Open (watching and confirmed) alerts, of the given pairs only when <paramref name="pairs"/> is not null.</summary>
    Task<IReadOnlyList<AlertState>> GetOpenAlertsAsync(IReadOnlyCollection<string>? pairs, CancellationToken cancellationToken);

    /// <summary>Pairs snoozed beyond <paramref name="now"/>, with the end of their snooze.</summary>
    Task<IReadOnlyDictionary<string, DateTimeOffset>> GetActiveSnoozesAsync(DateTimeOffset now, CancellationToken cancellationToken);

    /// <summary>
    /// Writes the decision's alert changes and the outbox messages in ONE transaction, so an alert is never
    /// marked notified without its message queued, nor a message queued for a state that was not stored.
    /// With a <paramref name="position"/>, the run feed's watermark is written in the same transaction: the runs
    /// behind the decision are marked read exactly when the decision is stored, so a crash at any point neither
    /// loses a decision nor makes one twice from the same runs.
    /// Returns <see cref="CycleDecision.Changes"/> in the same order, new ones with their ids. An outbox message
    /// whose Message-Id is already stored is skipped (the cycle was retried).
    /// </summary>
    Task<IReadOnlyList<AlertState>> ApplyCycleAsync(CycleDecision decision, IReadOnlyList<OutboxMessage> outbox, FeedPosition? position, CancellationToken cancellationToken);

    /// <summary>
    /// As above, with the outbox composed inside the transaction from the saved states, so a new alert's messages
    /// can name the id the store has just given it. <paramref name="composeOutbox"/> gets
    /// <see cref="CycleDecision.Changes"/> as saved (same order, new ones with their ids).
    /// </summary>
    Task<IReadOnlyList<AlertState>> ApplyCycleAsync(
        CycleDecision decision, Func<IReadOnlyList<AlertState>, IReadOnlyList<OutboxMessage>> composeOutbox, FeedPosition? position, CancellationToken cancellationToken);

    /// <summary>Open alerts and those cleared at or after <paramref name="clearedSince"/>, newest first.</summary>
    Task<IReadOnlyList<AlertState>> ListAlertsAsync(DateTimeOffset clearedSince, int limit, CancellationToken cancellationToken, string? pair = null);

    Task<AlertState?> GetAlertAsync(long id, CancellationToken cancellationToken);

    /// <summary>Acknowledges an open alert; false when there is no such open alert.</summary>
    Task<bool> AckAsync(long id, DateTimeOffset at, CancellationToken cancellationToken);

    /// <summary>Snoozes a pair until <paramref name="until"/> (replacing an earlier snooze).</summary>
    Task SnoozeAsync(string pair, DateTimeOffset until, DateTimeOffset now, string? reason, CancellationToken cancellationToken);

    Task<bool> UnsnoozeAsync(string pair, CancellationToken cancellationToken);

    Task<IReadOnlyList<PairSnooze>> ListSnoozesAsync(DateTimeOffset now, CancellationToken cancellationToken);

    /// <summary>Deletes alerts cleared before <paramref name="clearedBefore"/>; open ones are never deleted.</summary>
    Task<int> PruneClearedAsync(DateTimeOffset clearedBefore, CancellationToken cancellationToken);

    /// <summary>Deletes snoozes that ended before <paramref name="endedBefore"/> (no listing shows them any more).</summary>
    Task<int> PruneEndedSnoozesAsync(DateTimeOffset endedBefore, CancellationToken cancellationToken);
}
