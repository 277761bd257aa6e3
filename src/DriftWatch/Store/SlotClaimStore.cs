using Dapper;

namespace DriftWatch.Store;

/// <summary>
/// The <c>slot_claims</c> table (migration 013) over <see cref="IStoreDatabase"/>: one row per (pair, slot), the
/// primary key deciding which INSERT wins. Claims older than <see cref="Kept"/> are pruned at most once an hour.
/// </summary>
internal sealed class SlotClaimStore(IStoreDatabase database, string owner, TimeProvider time) : ISlotClaims
{
    /// <summary>How long claims are kept: far longer than any check, so a late job still finds its slot claimed.</summary>
    public static readonly TimeSpan Kept = TimeSpan.FromDays(2);

    private static readonly TimeSpan PruneEvery = TimeSpan.FromHours(1);

    private long _prunedAtMs;

    public async Task<bool> TryClaimAsync(string pair, DateTimeOffset slot, CancellationToken cancellationToken)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(pair);
        var now = time.GetUtcNow();
        await using var connection = await database.OpenAsync(cancellationToken);
        var last = Interlocked.Read(ref _prunedAtMs);
        if (now.ToUnixTimeMilliseconds() - last >= PruneEvery.TotalMilliseconds
            && Interlocked.CompareExchange(ref _prunedAtMs, now.ToUnixTimeMilliseconds(), last) == last)
        {
            await connection.ExecuteAsync(new CommandDefinition(
                "DELETE FROM slot_claims WHERE slot_ms < @before", new { before = (now - Kept).ToUnixTimeMilliseconds() }, cancellationToken: cancellationToken));
        }

        var inserted = await connection.ExecuteAsync(new CommandDefinition(
            """
            INSERT INTO slot_claims (pair, slot_ms, claimed_by, claimed_ms) VALUES (@pair, @slot, @owner, @now)
            ON CONFLICT (pair, slot_ms) DO NOTHING
            """,
            new { pair, slot = slot.ToUnixTimeMilliseconds(), owner, now = now.ToUnixTimeMilliseconds() },
            cancellationToken: cancellationToken));
        return inserted == 1;
    }
}
