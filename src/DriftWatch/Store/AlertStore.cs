using System.Data.Common;
using Dapper;
using DriftWatch.Core.Alerting;
using static DriftWatch.Store.AlertStoreText;

namespace DriftWatch.Store;

/// <summary>Alert states and snoozes over <see cref="IStoreDatabase"/>; the outbox is <see cref="OutboxStore"/>.</summary>
internal sealed class AlertStore(IStoreDatabase database) : IAlertStore
{
    private const string AlertColumns =
        "id AS Id, pair AS Pair, kind AS Kind, severity AS Severity, status AS Status, consecutive_runs AS ConsecutiveRuns, " +
        "first_seen_ms AS FirstSeenMs, last_seen_ms AS LastSeenMs, confirmed_at_ms AS ConfirmedAtMs, last_notified_at_ms AS LastNotifiedAtMs, " +
        "cleared_at_ms AS ClearedAtMs, acked_at_ms AS AckedAtMs, message AS Message, last_run_id AS LastRunId";

    public async Task<IReadOnlyList<AlertState>> GetOpenAlertsAsync(IReadOnlyCollection<string>? pairs, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var rows = await connection.QueryAsync<AlertRow>(new CommandDefinition(
            $"SELECT {AlertColumns} FROM alerts WHERE status <> 'cleared' ORDER BY id",
            cancellationToken: cancellationToken));
        // Filtering here rather than in SQL keeps one statement for both dialects (no array parameters in SQLite);
        // open alerts are few.
        var wanted = pairs is null ? null : new HashSet<string>(pairs, StringComparer.Ordinal);
        return [.. rows.Where(r => wanted is null || wanted.Contains(r.Pair)).Select(r => r.ToState())];
    }

    public async Task<IReadOnlyDictionary<string, DateTimeOffset>> GetActiveSnoozesAsync(DateTimeOffset now, CancellationToken cancellationToken)
    {
        var snoozes = await ListSnoozesAsync(now, cancellationToken);
        return snoozes.ToDictionary(s => s.Pair, s => s.Until, StringComparer.Ordinal);
    }

    public Task<IReadOnlyList<AlertState>> ApplyCycleAsync(CycleDecision decision, IReadOnlyList<OutboxMessage> outbox, FeedPosition? position, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(outbox);
        return ApplyCycleAsync(decision, _ => outbox, position, cancellationToken);
    }

    public async Task<IReadOnlyList<AlertState>> ApplyCycleAsync(
        CycleDecision decision, Func<IReadOnlyList<AlertState>, IReadOnlyList<OutboxMessage>> composeOutbox, FeedPosition? position, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(decision);
        ArgumentNullException.ThrowIfNull(composeOutbox);
        await using var connection = await database.OpenAsync(cancellationToken);
        await using var transaction = await connection.BeginTransactionAsync(cancellationToken);
        var saved = new List<AlertState>(decision.Changes.Count);
        foreach (var state in decision.Changes)
        {
            saved.Add(state.Id == 0
                ? state with { Id = await InsertAsync(connection, transaction, state, cancellationToken) }
                : await UpdateAsync(connection, transaction, state, cancellationToken));
        }

        foreach (var message in composeOutbox(saved))
        {
            await OutboxStore.InsertAsync(connection, transaction, message, cancellationToken);
        }

        if (position is not null)
        {
            await RunFeed.WriteAsync(connection, transaction, position, cancellationToken);
        }

        await transaction.CommitAsync(cancellationToken);
        return saved;
    }

    public async Task<IReadOnlyList<AlertState>> ListAlertsAsync(DateTimeOffset clearedSince, int limit, CancellationToken cancellationToken, string? pair = null)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var rows = await connection.QueryAsync<AlertRow>(new CommandDefinition(
            $"""
            SELECT {AlertColumns} FROM alerts
            WHERE (status <> 'cleared' OR cleared_at_ms >= @since) AND (@pair IS NULL OR pair = @pair)
            ORDER BY CASE WHEN status = 'cleared' THEN 1 ELSE 0 END, last_seen_ms DESC, id DESC
            LIMIT @limit
            """,
            new { since = Ms(clearedSince), pair, limit },
            cancellationToken: cancellationToken));
        return [.. rows.Select(r => r.ToState())];
    }

    public async Task<AlertState?> GetAlertAsync(long id, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var row = await connection.QuerySingleOrDefaultAsync<AlertRow>(new CommandDefinition(
            $"SELECT {AlertColumns} FROM alerts WHERE id = @id", new { id }, cancellationToken: cancellationToken));
        return row?.ToState();
    }

    public async Task<bool> AckAsync(long id, DateTimeOffset at, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var count = await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE alerts SET acked_at_ms = @at WHERE id = @id AND status <> 'cleared'",
            new { id, at = Ms(at) },
            cancellationToken: cancellationToken));
        return count == 1;
    }

    public async Task SnoozeAsync(string pair, DateTimeOffset until, DateTimeOffset now, string? reason, CancellationToken cancellationToken)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(pair);
        await using var connection = await database.OpenAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            """
            INSERT INTO snoozes (pair, until_ms, created_at_ms, reason) VALUES (@pair, @until, @now, @reason)
            ON CONFLICT (pair) DO UPDATE SET until_ms = excluded.until_ms, created_at_ms = excluded.created_at_ms, reason = excluded.reason
            """,
            new { pair, until = Ms(until), now = Ms(now), reason },
            cancellationToken: cancellationToken));
    }

    public async Task<bool> UnsnoozeAsync(string pair, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        return await connection.ExecuteAsync(new CommandDefinition(
            "DELETE FROM snoozes WHERE pair = @pair", new { pair }, cancellationToken: cancellationToken)) > 0;
    }

    public async Task<IReadOnlyList<PairSnooze>> ListSnoozesAsync(DateTimeOffset now, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var rows = await connection.QueryAsync<(string Pair, long UntilMs, long CreatedAtMs, string? Reason)>(new CommandDefinition(
            "SELECT pair, until_ms, created_at_ms, reason FROM snoozes WHERE until_ms > @now ORDER BY pair",
            new { now = Ms(now) },
            cancellationToken: cancellationToken));
        return [.. rows.Select(r => new PairSnooze(r.Pair, Time(r.UntilMs), Time(r.CreatedAtMs), r.Reason))];
    }

    public async Task<int> PruneClearedAsync(DateTimeOffset clearedBefore, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        return await connection.ExecuteAsync(new CommandDefinition(
            "DELETE FROM alerts WHERE status = 'cleared' AND cleared_at_ms < @before",
            new { before = Ms(clearedBefore) },
            cancellationToken: cancellationToken));
    }

    public async Task<int> PruneEndedSnoozesAsync(DateTimeOffset endedBefore, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        return await connection.ExecuteAsync(new CommandDefinition(
            "DELETE FROM snoozes WHERE until_ms < @before",
            new { before = Ms(endedBefore) },
            cancellationToken: cancellationToken));
    }

    private static async Task<long> InsertAsync(DbConnection connection, DbTransaction transaction, AlertState state, CancellationToken cancellationToken) =>
        await connection.ExecuteScalarAsync<long>(new CommandDefinition(
            """
            INSERT INTO alerts (pair, kind, severity, status, consecutive_runs, first_seen_ms, last_seen_ms, confirmed_at_ms,
                                last_notified_at_ms, cleared_at_ms, acked_at_ms, message, last_run_id)
            VALUES (@Pair, @Kind, @Severity, @Status, @ConsecutiveRuns, @FirstSeenMs, @LastSeenMs, @ConfirmedAtMs,
                    @LastNotifiedAtMs, @ClearedAtMs, @AckedAtMs, @Message, @LastRunId)
            RETURNING id
            """,
            AlertRow.From(state),
            transaction,
            cancellationToken: cancellationToken));

    private static async Task<AlertState> UpdateAsync(DbConnection connection, DbTransaction transaction, AlertState state, CancellationToken cancellationToken)
    {
        // acked_at is not written back: an ack may land between loading the states and storing the decision,
        // and the lifecycle never changes it. The stored value is read back instead.
        var acked = await connection.QuerySingleOrDefaultAsync<long?>(new CommandDefinition(
            """
            UPDATE alerts SET severity = @Severity, status = @Status, consecutive_runs = @ConsecutiveRuns, last_seen_ms = @LastSeenMs,
                              confirmed_at_ms = @ConfirmedAtMs, last_notified_at_ms = @LastNotifiedAtMs, cleared_at_ms = @ClearedAtMs,
                              message = @Message, last_run_id = @LastRunId
            WHERE id = @Id
            RETURNING acked_at_ms
            """,
            AlertRow.From(state),
            transaction,
            cancellationToken: cancellationToken));
        return state with { AckedAt = Time(acked) };
    }

    /// <summary>Column-for-column image of an alerts row (Dapper maps by the aliases in <see cref="AlertColumns"/>).</summary>
    private sealed class AlertRow
    {
        public long Id { get; init; }
        public string Pair { get; init; } = "";
        public string Kind { get; init; } = "";
        public string Severity { get; init; } = "";
        public string Status { get; init; } = "";
        public long ConsecutiveRuns { get; init; }
        public long FirstSeenMs { get; init; }
        public long LastSeenMs { get; init; }
        public long? ConfirmedAtMs { get; init; }
        public long? LastNotifiedAtMs { get; init; }
        public long? ClearedAtMs { get; init; }
        public long? AckedAtMs { get; init; }
        public string Message { get; init; } = "";
        public long? LastRunId { get; init; }

        public static AlertRow From(AlertState s) => new()
        {
            Id = s.Id,
            Pair = s.Pair,
            Kind = Name(s.Kind),
            Severity = Name(s.Severity),
            Status = Name(s.Status),
            ConsecutiveRuns = s.ConsecutiveRuns,
            FirstSeenMs = Ms(s.FirstSeen),
            LastSeenMs = Ms(s.LastSeen),
            ConfirmedAtMs = Ms(s.ConfirmedAt),
            LastNotifiedAtMs = Ms(s.LastNotifiedAt),
            ClearedAtMs = Ms(s.ClearedAt),
            AckedAtMs = Ms(s.AckedAt),
            Message = s.Message,
            LastRunId = s.LastRunId,
        };

        public AlertState ToState() => new(
            Id,
            Pair,
            AlertStoreText.Kind(Kind),
            AlertStoreText.Severity(Severity),
            AlertStoreText.Status(Status),
            checked((int)ConsecutiveRuns),
            Time(FirstSeenMs),
            Time(LastSeenMs),
            Time(ConfirmedAtMs),
            Time(LastNotifiedAtMs),
            Time(ClearedAtMs),
            Time(AckedAtMs),
            Message,
            LastRunId);
    }
}
