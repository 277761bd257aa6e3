using Dapper;

namespace DriftWatch.Store;

/// <summary>
/// Named leases in the store (worker_leases): one holder at a time, each until its expiry. A holder that dies simply
/// stops renewing, and the lease is free again once it has run out; no lock outlives its process for longer.
/// </summary>
internal sealed class WorkerLeases(IStoreDatabase database)
{
    /// <summary>Takes the lease when it is free, expired, or already <paramref name="holder"/>'s; true when taken.</summary>
    public async Task<bool> TryAcquireAsync(string name, string holder, DateTimeOffset now, TimeSpan ttl, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(name);
        ArgumentNullException.ThrowIfNull(holder);
        await using var connection = await database.OpenAsync(cancellationToken);
        // One statement, atomic on both dialects: the conflict branch writes only when the lease is free to take.
        var taken = await connection.ExecuteAsync(new CommandDefinition(
            """
            INSERT INTO worker_leases (name, holder, expires_at_ms) VALUES (@name, @holder, @expires)
            ON CONFLICT (name) DO UPDATE SET holder = excluded.holder, expires_at_ms = excluded.expires_at_ms
            WHERE worker_leases.expires_at_ms <= @now OR worker_leases.holder = excluded.holder
            """,
            new { name, holder, now = now.ToUnixTimeMilliseconds(), expires = (now + ttl).ToUnixTimeMilliseconds() },
            cancellationToken: cancellationToken));
        return taken == 1;
    }

    /// <summary>Moves the expiry on; false when the lease is no longer <paramref name="holder"/>'s (it ran out and was taken).</summary>
    public async Task<bool> RenewAsync(string name, string holder, DateTimeOffset now, TimeSpan ttl, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var renewed = await connection.ExecuteAsync(new CommandDefinition(
            "UPDATE worker_leases SET expires_at_ms = @expires WHERE name = @name AND holder = @holder AND expires_at_ms > @now",
            new { name, holder, now = now.ToUnixTimeMilliseconds(), expires = (now + ttl).ToUnixTimeMilliseconds() },
            cancellationToken: cancellationToken));
        return renewed == 1;
    }

    public async Task ReleaseAsync(string name, string holder, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            "DELETE FROM worker_leases WHERE name = @name AND holder = @holder", new { name, holder }, cancellationToken: cancellationToken));
    }

    /// <summary>Who holds <paramref name="name"/> now (tests and diagnostics); null when free or expired.</summary>
    public async Task<string?> HolderAsync(string name, DateTimeOffset now, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        return await connection.QuerySingleOrDefaultAsync<string?>(new CommandDefinition(
            "SELECT holder FROM worker_leases WHERE name = @name AND expires_at_ms > @now",
            new { name, now = now.ToUnixTimeMilliseconds() },
            cancellationToken: cancellationToken));
    }
}
