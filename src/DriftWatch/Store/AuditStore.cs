using Dapper;
using DriftWatch.Core.Triage;

namespace DriftWatch.Store;

/// <summary>The audit log over <see cref="IStoreDatabase"/>: append-only, never updated, not pruned with runs.</summary>
internal sealed class AuditStore(IStoreDatabase database) : IAuditStore
{
    public const int MaxReasonLength = 500;

    public async Task<long> AppendAsync(AuditEntry entry, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(entry);
        ArgumentException.ThrowIfNullOrWhiteSpace(entry.Actor);
        await using var connection = await database.OpenAsync(cancellationToken);
        return await connection.ExecuteScalarAsync<long>(new CommandDefinition(
            """
            INSERT INTO audit_log (at_ms, actor, via, action, pair, alert_id, run_id, reason, detail)
            VALUES (@at, @actor, @via, @action, @pair, @alertId, @runId, @reason, @detail)
            RETURNING id
            """,
            new
            {
                at = Ms(entry.At),
                actor = entry.Actor,
                via = entry.Via,
                action = Name(entry.Action),
                pair = entry.Pair,
                alertId = entry.AlertId,
                runId = entry.RunId,
                reason = entry.Reason is { Length: > MaxReasonLength } r ? r[..MaxReasonLength] : entry.Reason,
                detail = entry.Detail,
            },
            cancellationToken: cancellationToken));
    }

    public async Task<IReadOnlyList<AuditEntry>> ListAsync(string? pair, int limit, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var rows = await connection.QueryAsync<AuditRow>(new CommandDefinition(
            """
            SELECT id AS Id, at_ms AS AtMs, actor AS Actor, via AS Via, action AS Action, pair AS Pair,
                   alert_id AS AlertId, run_id AS RunId, reason AS Reason, detail AS Detail
            FROM audit_log WHERE (@pair IS NULL OR pair = @pair)
            ORDER BY at_ms DESC, id DESC
            LIMIT @limit
            """,
            new { pair, limit = Math.Max(1, limit) },
            cancellationToken: cancellationToken));
        return [.. rows.Select(r => new AuditEntry(r.Id, Time(r.AtMs), r.Actor, r.Via, ParseAction(r.Action), r.Pair, r.AlertId, r.RunId, r.Reason, r.Detail))];
    }

    /// <summary>The stored (and printed) form: snake_case, as the migration's CHECK lists it.</summary>
    public static string Name(AuditAction action) => StoreJson.EnumText(action);

    private static AuditAction ParseAction(string text)
    {
        foreach (var action in Enum.GetValues<AuditAction>())
        {
            if (Name(action) == text)
            {
                return action;
            }
        }

        throw new InvalidDataException($"The store holds an unknown audit action '{text}' (written by a newer DriftWatch?).");
    }

    private static long Ms(DateTimeOffset at) => at.ToUnixTimeMilliseconds();

    private static DateTimeOffset Time(long ms) => DateTimeOffset.FromUnixTimeMilliseconds(ms);

    // Dapper maps by column name; a class with settable properties reads the same on both providers.
    private sealed class AuditRow
    {
        public long Id { get; init; }

        public long AtMs { get; init; }

        public string Actor { get; init; } = "";

        public string Via { get; init; } = "";

        public string Action { get; init; } = "";

        public string? Pair { get; init; }

        public long? AlertId { get; init; }

        public long? RunId { get; init; }

        public string? Reason { get; init; }

        public string? Detail { get; init; }
    }
}
