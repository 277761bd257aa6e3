using System.Security.Cryptography;
using System.Text;
using Dapper;
using DriftWatch.Sources;

namespace DriftWatch.Store;

/// <summary>
/// The <c>column_hints</c> table (migration 014) over <see cref="IStoreDatabase"/>. Keys are stored as their SHA-256:
/// a key carries the table or the whole query text, which may exceed what an index entry can hold.
/// </summary>
internal sealed class ColumnHintStore(IStoreDatabase database) : IColumnHints
{
    public async Task<IReadOnlyDictionary<string, ColumnHint>> ReadAsync(string source, IReadOnlyCollection<string> keys, CancellationToken cancellationToken)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(source);
        ArgumentNullException.ThrowIfNull(keys);
        var byHash = keys.Distinct(StringComparer.Ordinal).ToDictionary(Hash, k => k, StringComparer.Ordinal);
        if (byHash.Count == 0)
        {
            return new Dictionary<string, ColumnHint>(StringComparer.Ordinal);
        }

        await using var connection = await database.OpenAsync(cancellationToken);
        var rows = await connection.QueryAsync<Row>(new CommandDefinition(
            // Dapper hands Npgsql a list as one array parameter, and expands it into a list of parameters for SQLite.
            "SELECT column_key AS ColumnKey, mean AS Mean, all_finite AS AllFinite FROM column_hints WHERE source = @source AND column_key "
                + (database.Dialect == StoreDialect.Postgres ? "= ANY(@keys)" : "IN @keys"),
            new { source, keys = byHash.Keys.ToList() },
            cancellationToken: cancellationToken));
        return rows.ToDictionary(r => byHash[r.ColumnKey], r => new ColumnHint(r.Mean, r.AllFinite != 0), StringComparer.Ordinal);
    }

    public async Task WriteAsync(string source, IReadOnlyDictionary<string, ColumnHint> hints, DateTimeOffset readAt, CancellationToken cancellationToken)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(source);
        ArgumentNullException.ThrowIfNull(hints);
        if (hints.Count == 0)
        {
            return;
        }

        await using var connection = await database.OpenAsync(cancellationToken);
        await using var transaction = await connection.BeginTransactionAsync(cancellationToken);
        await connection.ExecuteAsync(new CommandDefinition(
            """
            INSERT INTO column_hints (source, column_key, mean, all_finite, read_ms) VALUES (@Source, @Key, @Mean, @AllFinite, @ReadMs)
            ON CONFLICT (source, column_key) DO UPDATE SET mean = excluded.mean, all_finite = excluded.all_finite, read_ms = excluded.read_ms
            """,
            hints.Select(h => new { Source = source, Key = Hash(h.Key), h.Value.Mean, AllFinite = h.Value.AllFinite ? 1 : 0, ReadMs = readAt.ToUnixTimeMilliseconds() }),
            transaction,
            cancellationToken: cancellationToken));
        await transaction.CommitAsync(cancellationToken);
    }

    /// <summary>Deletes hints of columns no shared read has touched since <paramref name="before"/> (pairs removed, tables gone).</summary>
    public async Task<int> PruneAsync(DateTimeOffset before, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        return await connection.ExecuteAsync(new CommandDefinition(
            "DELETE FROM column_hints WHERE read_ms < @before", new { before = before.ToUnixTimeMilliseconds() }, cancellationToken: cancellationToken));
    }

    private static string Hash(string key) => Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(key)));

    // Settable properties, not a positional record: Dapper converts INTEGER/BIGINT per dialect into them.
    private sealed class Row
    {
        public string ColumnKey { get; set; } = string.Empty;

        public double? Mean { get; set; }

        public long AllFinite { get; set; }
    }
}
