using DriftWatch.Core.Alerting;

namespace DriftWatch.Store;

/// <summary>
/// The outbox: composed messages waiting for their channel, claimed with a lease, marked sent or failed. Messages
/// are written with the decision that caused them (<see cref="IAlertStore.ApplyCycleAsync"/>), never alone.
/// </summary>
internal interface IOutboxStore
{
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

    /// <summary>Newest first, without the message bytes; <paramref name="unsentOnly"/> leaves out sent and failed ones.</summary>
    Task<IReadOnlyList<OutboxEntry>> ListOutboxAsync(bool unsentOnly, int limit, CancellationToken cancellationToken);

    Task MarkSentAsync(long id, DateTimeOffset at, CancellationToken cancellationToken);

    Task MarkFailedAsync(long id, string error, DateTimeOffset nextAttemptAt, CancellationToken cancellationToken);

    /// <summary>
    /// Records that a receiver refused this message for good (the error says why): it is kept for audit and never
    /// claimed again. Only for a refusal of the message itself, never for an outage.
    /// </summary>
    Task MarkGivenUpAsync(long id, string error, DateTimeOffset at, CancellationToken cancellationToken);

    /// <summary>Deletes entries sent, or failed for good, before <paramref name="sentBefore"/>; unsent ones are never deleted.</summary>
    Task<int> PruneSentAsync(DateTimeOffset sentBefore, CancellationToken cancellationToken);
}
