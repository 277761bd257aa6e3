using System.Data.Common;
using Dapper;
using DriftWatch.Core.Alerting;
using static DriftWatch.Store.AlertStoreText;

namespace DriftWatch.Store;

/// <summary>The outbox over <see cref="IStoreDatabase"/>; messages are inserted by <see cref="AlertStore.ApplyCycleAsync"/>.</summary>
internal sealed class OutboxStore(IStoreDatabase database) : IOutboxStore
{
    private const string OutboxColumns =
        "id AS Id, message_id AS MessageId, mailing_list AS MailingList, channel AS Channel, created_at_ms AS CreatedAtMs, " +
        "next_attempt_at_ms AS NextAttemptAtMs, attempts AS Attempts, last_error AS LastError, sent_at_ms AS SentAtMs, " +
        "subject AS Subject, recipients AS Recipients, failed_at_ms AS FailedAtMs";

    public async Task<IReadOnlyList<OutboxEntry>> ClaimDueAsync(DateTimeOffset now, TimeSpan lease, string owner, int limit, CancellationToken cancellationToken)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(limit, 1);
        ArgumentException.ThrowIfNullOrEmpty(owner);
        // One statement claims and returns: PostgreSQL skips rows another dispatcher has locked; SQLite has a
        // single writer, so the statement is atomic as it stands.
        var skipLocked = database.Dialect == StoreDialect.Postgres ? "FOR UPDATE SKIP LOCKED" : "";
        await using var connection = await database.OpenAsync(cancellationToken);
        var rows = await connection.QueryAsync<OutboxRow>(new CommandDefinition(
            $"""
            UPDATE outbox SET next_attempt_at_ms = @leaseUntil, claimed_by = @owner
            WHERE id IN (SELECT id FROM outbox WHERE sent_at_ms IS NULL AND failed_at_ms IS NULL AND next_attempt_at_ms <= @now
                         ORDER BY next_attempt_at_ms, id LIMIT @limit {skipLocked})
            RETURNING {OutboxColumns}, mime AS Mime
            """,
            new { now = Ms(now), leaseUntil = Ms(now + lease), owner, limit },
            cancellationToken: cancellationToken));
        return [.. rows.OrderBy(r => r.CreatedAtMs).ThenBy(r => r.Id).Select(r => r.ToEntry())];
    }

    public async Task<int> RenewClaimsAsync(IReadOnlyCollection<long> ids, string owner, DateTimeOffset until, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(ids);
        if (ids.Count == 0)
        {
            return 0;
        }

        // Dapper hands PostgreSQL the list as one array parameter and expands it into a list for SQLite.
        var inIds = database.Dialect == StoreDialect.Postgres ? "id = ANY(@ids)" : "id IN @ids";
        await using var connection = await database.OpenAsync(cancellationToken);
        // Marking sent or failed clears claimed_by, so a renewal that lands after it cannot move a retry forward.
        return await connection.ExecuteAsync(new CommandDefinition(
            $"UPDATE outbox SET next_attempt_at_ms = @until WHERE {inIds} AND claimed_by = @owner AND sent_at_ms IS NULL",
            new { ids = ids.ToArray(), owner, until = Ms(until) },
            cancellationToken: cancellationToken));
    }

    public async Task<int> TakeBackClaimsAsync(string owner, DateTimeOffset now, CancellationToken cancellationToken)
    {
        ArgumentException.ThrowIfNullOrEmpty(owner);
        await using var connection = await database.OpenAsync(cancellationToken);
        return await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE outbox SET next_attempt_at_ms = @now, claimed_by = NULL WHERE claimed_by = @owner AND sent_at_ms IS NULL AND failed_at_ms IS NULL",
            new { owner, now = Ms(now) },
            cancellationToken: cancellationToken));
    }

    public async Task<IReadOnlyList<OutboxEntry>> ListOutboxAsync(bool unsentOnly, int limit, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var rows = await connection.QueryAsync<OutboxRow>(new CommandDefinition(
            $"SELECT {OutboxColumns} FROM outbox WHERE (@unsentOnly = 0 OR (sent_at_ms IS NULL AND failed_at_ms IS NULL)) ORDER BY id DESC LIMIT @limit",
            new { unsentOnly = unsentOnly ? 1 : 0, limit },
            cancellationToken: cancellationToken));
        return [.. rows.Select(r => r.ToEntry())];
    }

    public async Task MarkSentAsync(long id, DateTimeOffset at, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE outbox SET sent_at_ms = @at, attempts = attempts + 1, last_error = NULL, claimed_by = NULL WHERE id = @id",
            new { id, at = Ms(at) },
            cancellationToken: cancellationToken));
    }

    public async Task MarkFailedAsync(long id, string error, DateTimeOffset nextAttemptAt, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE outbox SET attempts = attempts + 1, last_error = @error, next_attempt_at_ms = @next, claimed_by = NULL WHERE id = @id AND sent_at_ms IS NULL",
            new { id, error, next = Ms(nextAttemptAt) },
            cancellationToken: cancellationToken));
    }

    public async Task MarkGivenUpAsync(long id, string error, DateTimeOffset at, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE outbox SET attempts = attempts + 1, last_error = @error, failed_at_ms = @at, claimed_by = NULL WHERE id = @id AND sent_at_ms IS NULL",
            new { id, error, at = Ms(at) },
            cancellationToken: cancellationToken));
    }

    public async Task<int> PruneSentAsync(DateTimeOffset sentBefore, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        return await connection.ExecuteAsync(new CommandDefinition(
            "DELETE FROM outbox WHERE (sent_at_ms IS NOT NULL AND sent_at_ms < @before) OR (failed_at_ms IS NOT NULL AND failed_at_ms < @before)",
            new { before = Ms(sentBefore) },
            cancellationToken: cancellationToken));
    }

    /// <summary>Queues one message inside the caller's transaction (the one that stores the decision behind it).</summary>
    internal static async Task InsertAsync(DbConnection connection, DbTransaction transaction, OutboxMessage message, CancellationToken cancellationToken) =>
        await connection.ExecuteAsync(new CommandDefinition(
            """
            INSERT INTO outbox (message_id, mailing_list, channel, created_at_ms, next_attempt_at_ms, attempts, subject, recipients, mime)
            VALUES (@MessageId, @MailingList, @Channel, @CreatedAtMs, @CreatedAtMs, 0, @Subject, @Recipients, @Mime)
            ON CONFLICT (message_id) DO NOTHING
            """,
            new
            {
                message.MessageId,
                message.MailingList,
                Channel = Name(message.Channel),
                CreatedAtMs = Ms(message.CreatedAt),
                message.Subject,
                Recipients = Recipients(message.Recipients),
                message.Mime,
            },
            transaction,
            cancellationToken: cancellationToken));

    private sealed class OutboxRow
    {
        public long Id { get; init; }
        public string MessageId { get; init; } = "";
        public string MailingList { get; init; } = "";
        public string Channel { get; init; } = "";
        public long CreatedAtMs { get; init; }
        public long NextAttemptAtMs { get; init; }
        public long Attempts { get; init; }
        public string? LastError { get; init; }
        public long? SentAtMs { get; init; }
        public string Subject { get; init; } = "";
        public string Recipients { get; init; } = "[]";
        public byte[]? Mime { get; init; }
        public long? FailedAtMs { get; init; }

        public OutboxEntry ToEntry() => new(
            Id,
            MessageId,
            MailingList,
            AlertStoreText.Channel(Channel),
            Time(CreatedAtMs),
            Time(NextAttemptAtMs),
            checked((int)Attempts),
            LastError,
            Time(SentAtMs),
            Subject,
            AlertStoreText.Recipients(Recipients),
            Mime,
            Time(FailedAtMs));
    }
}
