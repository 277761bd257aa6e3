using Dapper;

namespace DriftWatch.Store;

/// <summary>The <c>baseline_resets</c> table over <see cref="IStoreDatabase"/>; one row per pair at most.</summary>
internal sealed class BaselineResetStore(IStoreDatabase database) : IBaselineResetStore
{
    public async Task<DateTimeOffset?> GetResetAsync(string pair, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var ms = await connection.QuerySingleOrDefaultAsync<long?>(new CommandDefinition(
            "SELECT reset_at_ms FROM baseline_resets WHERE pair = @pair", new { pair }, cancellationToken: cancellationToken));
        return ms is null ? null : DateTimeOffset.FromUnixTimeMilliseconds(ms.Value);
    }

    public async Task SetResetAsync(string pair, DateTimeOffset at, CancellationToken cancellationToken)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(pair);
        await using var connection = await database.OpenAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            """
            INSERT INTO baseline_resets (pair, reset_at_ms) VALUES (@pair, @at)
            ON CONFLICT (pair) DO UPDATE SET reset_at_ms = excluded.reset_at_ms
            """,
            new { pair, at = at.ToUnixTimeMilliseconds() },
            cancellationToken: cancellationToken));
    }

    public async Task ClearResetAsync(string pair, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            "DELETE FROM baseline_resets WHERE pair = @pair", new { pair }, cancellationToken: cancellationToken));
    }
}
