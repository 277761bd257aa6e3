using DriftWatch.Core.Alerting;

namespace DriftWatch.Store;

/// <summary>Alert states, snoozes and the outbox. One implementation serves SQLite and PostgreSQL.</summary>
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

    /// <summary>Open alerts and those cleared at or after <paramref name="clearedSince"/>, newest first.</summary>
    Task<IReadOnlyList<AlertState>> ListAlertsAsync(DateTimeOffset clearedSince, int limit, CancellationToken cancellationToken, string? pair = null);

    Task<AlertState?> GetAlertAsync(long id, CancellationToken cancellationToken);

    /// <summary>Acknowledges an open alert; false when there is no such open alert.</summary>
    Task<bool> AckAsync(long id, DateTimeOffset at, CancellationToken cancellationToken);

    /// <summary>Snoozes a pair until <paramref name="until"/> (replacing an earlier snooze).</summary>
    Task SnoozeAsync(string pair, DateTimeOffset until, DateTimeOffset now, string? reason, CancellationToken cancellationToken);

    Task<bool> UnsnoozeAsync(string pair, CancellationToken cancellationToken);

    Task<IReadOnlyList<PairSnooze>> ListSnoozesAsync(DateTimeOffset now, CancellationToken cancellationToken);

    /// <summary>
    /// Unsent entries due at <paramref name="now"/>, oldest first, each leased to <paramref name="owner"/> until
    /// now + <paramref name="lease"/> (its next attempt moves there) so a second dispatcher, here or on another
    /// instance, does not take it too.
    /// </summary>
    Task<IReadOnlyList<OutboxEntry>> ClaimDueAsync(DateTimeOffset now, TimeSpan lease, string owner, int limit, CancellationToken cancellationToken);

    /// <summary>Extends to <paramref name="until"/> the leases <paramref name="owner"/> still holds among <paramref name="ids"/> (sent or failed ones are no longer held).</summary>
    Task<int> RenewClaimsAsync(IReadOnlyCollection<long> ids, string owner, DateTimeOffset until, CancellationToken cancellationToken);

    /// <summary>
    /// Makes every unsent entry leased to <paramref name="owner"/> due at <paramref name="now"/> and unclaimed: a
    /// restarted worker takes back what it held when it died instead of waiting for the leases to run out.
    /// </summary>
    Task<int> TakeBackClaimsAsync(string owner, DateTimeOffset now, CancellationToken cancellationToken);

    /// <summary>Newest first, without the message bytes.</summary>
    Task<IReadOnlyList<OutboxEntry>> ListOutboxAsync(bool unsentOnly, int limit, CancellationToken cancellationToken);

    Task MarkSentAsync(long id, DateTimeOffset at, CancellationToken cancellationToken);

    Task MarkFailedAsync(long id, string error, DateTimeOffset nextAttemptAt, CancellationToken cancellationToken);

    /// <summary>Deletes sent entries sent before <paramref name="sentBefore"/> and alerts cleared before <paramref name="clearedBefore"/>.</summary>
    Task<int> PruneAsync(DateTimeOffset sentBefore, DateTimeOffset clearedBefore, CancellationToken cancellationToken);
}
