using System.Data.Common;
using System.Globalization;
using Dapper;

namespace DriftWatch.Store;

/// <summary>
/// Runs in the order they were recorded, after a durable watermark, so alert evaluation sees every run exactly
/// once whichever entry point (worker, <c>check</c>, demo) recorded it.
/// </summary>
internal sealed class RunFeed(IStoreDatabase database)
{
    public const string AlertsWatermarkKey = "alerts.last_run_id";

    /// <summary>
    /// PostgreSQL advisory lock between recording runs (shared, for the insert's transaction) and reading the feed
    /// (exclusive, for the read). Ids come from a sequence, and with several writers a run can commit after a run
    /// with a higher id; a reader that saw the higher one would move its watermark past the lower one for good.
    /// Reading under the exclusive lock waits for every insert in flight, so the ids it sees have no hole that a
    /// later commit could fill. SQLite serialises its writers, so ids there commit in order.
    /// </summary>
    internal const long RecordLockKey = 0x44_72_69_66_74_57_02;

    public async Task<long> GetWatermarkAsync(string key, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var value = await connection.QuerySingleOrDefaultAsync<string?>(new CommandDefinition(
            "SELECT value FROM worker_state WHERE key = @key", new { key }, cancellationToken: cancellationToken));
        return value is null ? 0 : long.Parse(value, CultureInfo.InvariantCulture);
    }

    /// <summary>Runs passed over as unreadable by the reader of <paramref name="key"/>, since the store was created.</summary>
    public async Task<long> GetUnreadableCountAsync(string key, CancellationToken cancellationToken) =>
        await GetWatermarkAsync(new FeedPosition(key, 0).UnreadableKey, cancellationToken);

    /// <summary>Moves the position on when nothing else is to be stored with it (one statement, atomic on its own).</summary>
    public async Task AdvanceAsync(FeedPosition position, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(position);
        await using var connection = await database.OpenAsync(cancellationToken);
        await using var transaction = await connection.BeginTransactionAsync(cancellationToken);
        await WriteAsync(connection, transaction, position, cancellationToken);
        await transaction.CommitAsync(cancellationToken);
    }

    /// <summary>Writes <paramref name="position"/> inside the caller's transaction (the alert store commits it with the cycle).</summary>
    internal static async Task WriteAsync(DbConnection connection, DbTransaction transaction, FeedPosition position, CancellationToken cancellationToken)
    {
        await connection.ExecuteAsync(new CommandDefinition(
            "INSERT INTO worker_state (key, value) VALUES (@key, @value) ON CONFLICT (key) DO UPDATE SET value = excluded.value",
            new { key = position.Key, value = position.LastRunId.ToString(CultureInfo.InvariantCulture) },
            transaction,
            cancellationToken: cancellationToken));
        if (position.UnreadableRuns > 0)
        {
            // A running total kept as text like every worker_state value; CAST reads it back on both dialects.
            await connection.ExecuteAsync(new CommandDefinition(
                """
                INSERT INTO worker_state (key, value) VALUES (@key, @value)
                ON CONFLICT (key) DO UPDATE SET value = CAST(CAST(worker_state.value AS BIGINT) + @added AS TEXT)
                """,
                new { key = position.UnreadableKey, value = position.UnreadableRuns.ToString(CultureInfo.InvariantCulture), added = (long)position.UnreadableRuns },
                transaction,
                cancellationToken: cancellationToken));
        }
    }

    /// <summary>
    /// Ids and pairs of runs recorded after <paramref name="afterId"/>, oldest first. Back-dated runs (<c>check
    /// --as-of</c>) are left out: they are about the past, so they never count toward an alert or mail anyone; the
    /// watermark moves past them with the next run read.
    /// </summary>
    public async Task<IReadOnlyList<(long Id, string Pair)>> GetRunsAfterAsync(long afterId, int limit, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        await using var transaction = await connection.BeginTransactionAsync(cancellationToken);
        if (database.Dialect == StoreDialect.Postgres)
        {
            await connection.ExecuteAsync(new CommandDefinition(
                "SELECT pg_advisory_xact_lock(@key)", new { key = RecordLockKey }, transaction, cancellationToken: cancellationToken));
        }

        var rows = await connection.QueryAsync<(long, string)>(new CommandDefinition(
            "SELECT id, pair FROM runs WHERE id > @afterId AND back_dated_at_ms IS NULL ORDER BY id LIMIT @limit",
            new { afterId, limit },
            transaction,
            cancellationToken: cancellationToken));
        var list = rows.ToList();
        await transaction.CommitAsync(cancellationToken);
        return list;
    }
}
