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

    public async Task<long> GetWatermarkAsync(string key, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var value = await connection.QuerySingleOrDefaultAsync<string?>(new CommandDefinition(
            "SELECT value FROM worker_state WHERE key = @key", new { key }, cancellationToken: cancellationToken));
        return value is null ? 0 : long.Parse(value, CultureInfo.InvariantCulture);
    }

    public async Task SetWatermarkAsync(string key, long runId, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            "INSERT INTO worker_state (key, value) VALUES (@key, @value) ON CONFLICT (key) DO UPDATE SET value = excluded.value",
            new { key, value = runId.ToString(CultureInfo.InvariantCulture) },
            cancellationToken: cancellationToken));
    }

    /// <summary>Ids and pairs of runs recorded after <paramref name="afterId"/>, oldest first.</summary>
    public async Task<IReadOnlyList<(long Id, string Pair)>> GetRunsAfterAsync(long afterId, int limit, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var rows = await connection.QueryAsync<(long, string)>(new CommandDefinition(
            "SELECT id, pair FROM runs WHERE id > @afterId ORDER BY id LIMIT @limit",
            new { afterId, limit },
            cancellationToken: cancellationToken));
        return [.. rows];
    }
}
