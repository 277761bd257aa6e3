using Dapper;

namespace DriftWatch.Store;

/// <summary>One running <c>driftwatch run</c> process as the store knows it (worker_instances).</summary>
internal sealed record WorkerInstance(
    string Id,
    string Host,
    int Pid,
    DateTimeOffset StartedAt,
    DateTimeOffset LastSeenAt,
    string ConfigSha256,
    bool SharedSchedule,
    string? LastPair,
    DateTimeOffset? LastCheckAt);

/// <summary>The workers' heartbeats: each worker writes its own row; /healthz, the dashboard and the other workers read them.</summary>
internal sealed class WorkerInstances(IStoreDatabase database)
{
    /// <summary>Rows of workers gone this long are deleted by the next heartbeat of any worker.</summary>
    public static readonly TimeSpan ForgetAfter = TimeSpan.FromDays(7);

    public async Task BeatAsync(WorkerInstance instance, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(instance);
        await using var connection = await database.OpenAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            """
            INSERT INTO worker_instances (id, host, pid, started_at_ms, last_seen_at_ms, config_sha256, shared_schedule, last_pair, last_check_at_ms)
            VALUES (@Id, @Host, @Pid, @StartedAtMs, @LastSeenAtMs, @ConfigSha256, @Shared, @LastPair, @LastCheckAtMs)
            ON CONFLICT (id) DO UPDATE SET last_seen_at_ms = excluded.last_seen_at_ms, config_sha256 = excluded.config_sha256,
                shared_schedule = excluded.shared_schedule, last_pair = excluded.last_pair, last_check_at_ms = excluded.last_check_at_ms
            """,
            new
            {
                instance.Id,
                instance.Host,
                instance.Pid,
                StartedAtMs = instance.StartedAt.ToUnixTimeMilliseconds(),
                LastSeenAtMs = instance.LastSeenAt.ToUnixTimeMilliseconds(),
                instance.ConfigSha256,
                Shared = instance.SharedSchedule ? 1 : 0,
                instance.LastPair,
                LastCheckAtMs = instance.LastCheckAt?.ToUnixTimeMilliseconds(),
            },
            cancellationToken: cancellationToken));
        await connection.ExecuteAsync(new CommandDefinition(
            "DELETE FROM worker_instances WHERE last_seen_at_ms < @before",
            new { before = (instance.LastSeenAt - ForgetAfter).ToUnixTimeMilliseconds() },
            cancellationToken: cancellationToken));
    }

    /// <summary>A clean stop removes the row at once: the worker is gone, not merely silent.</summary>
    public async Task RemoveAsync(string id, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition("DELETE FROM worker_instances WHERE id = @id", new { id }, cancellationToken: cancellationToken));
    }

    /// <summary>Every known worker, most recently seen first.</summary>
    public async Task<IReadOnlyList<WorkerInstance>> ListAsync(CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var rows = await connection.QueryAsync<Row>(new CommandDefinition(
            """
            SELECT id AS Id, host AS Host, pid AS Pid, started_at_ms AS StartedAtMs, last_seen_at_ms AS LastSeenAtMs,
                   config_sha256 AS ConfigSha256, shared_schedule AS Shared, last_pair AS LastPair, last_check_at_ms AS LastCheckAtMs
            FROM worker_instances ORDER BY last_seen_at_ms DESC, id
            """,
            cancellationToken: cancellationToken));
        return [.. rows.Select(r => new WorkerInstance(
            r.Id,
            r.Host,
            (int)r.Pid,
            DateTimeOffset.FromUnixTimeMilliseconds(r.StartedAtMs),
            DateTimeOffset.FromUnixTimeMilliseconds(r.LastSeenAtMs),
            r.ConfigSha256,
            r.Shared != 0,
            r.LastPair,
            r.LastCheckAtMs is { } at ? DateTimeOffset.FromUnixTimeMilliseconds(at) : null))];
    }

    // Settable properties, not a positional record: Dapper converts INTEGER/BIGINT per dialect into them.
    private sealed class Row
    {
        public string Id { get; set; } = string.Empty;

        public string Host { get; set; } = string.Empty;

        public long Pid { get; set; }

        public long StartedAtMs { get; set; }

        public long LastSeenAtMs { get; set; }

        public string ConfigSha256 { get; set; } = string.Empty;

        public long Shared { get; set; }

        public string? LastPair { get; set; }

        public long? LastCheckAtMs { get; set; }
    }
}
