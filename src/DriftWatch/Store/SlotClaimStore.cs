using Dapper;

namespace DriftWatch.Store;

/// <summary>
/// The <c>slot_claims</c> table (migration 013) over <see cref="IStoreDatabase"/>: one row per (pair, slot), the
/// primary key deciding which INSERT wins. Claims older than <see cref="Kept"/> are pruned at most once an hour.
/// The owner is the worker process (<see cref="Workers.WorkerIdentity"/>, its Quartz instance id), not the worker's
/// name, which a restarted worker keeps: a claim of the process that died must be told from its successor's.
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

    public async Task<bool> TryTakeOverAsync(string pair, DateTimeOffset slot, CancellationToken cancellationToken)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(pair);
        if (database.Dialect != StoreDialect.Postgres)
        {
            // Only the shared schedule (PostgreSQL store) recovers a dead worker's jobs; on the in-memory schedule a
            // claim's holder is this process or one that is gone together with its jobs.
            return false;
        }

        // Quartz deletes a dead member's row from qrtz_scheduler_state in the same transaction that schedules its
        // jobs for recovery, so a recovered job always finds its dead worker missing there, and a live holder present.
        // Two workers taking over at once: the row lock orders them and the second finds the first one alive.
        await using var connection = await database.OpenAsync(cancellationToken);
        var updated = await connection.ExecuteAsync(new CommandDefinition(
            """
            UPDATE slot_claims SET claimed_by = @owner, claimed_ms = @now
            WHERE pair = @pair AND slot_ms = @slot AND claimed_by <> @owner
              AND NOT EXISTS (SELECT 1 FROM qrtz_scheduler_state s WHERE s.sched_name = @scheduler AND s.instance_name = slot_claims.claimed_by)
            """,
            new { pair, slot = slot.ToUnixTimeMilliseconds(), owner, now = time.GetUtcNow().ToUnixTimeMilliseconds(), scheduler = Scheduling.SharedSchedule.SchedulerName },
            cancellationToken: cancellationToken));
        return updated == 1;
    }
}
