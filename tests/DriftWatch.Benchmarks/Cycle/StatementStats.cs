using Npgsql;

namespace DriftWatch.Benchmarks.Cycle;

/// <summary>One kind of statement the checks sent, summed over the measured cycles (from pg_stat_statements).</summary>
internal sealed record StatementKind(string Kind, long Calls, double TotalMs, long Rows);

/// <summary>
/// Where the server's time goes, by the kind of statement a check sends, from the pg_stat_statements
/// extension (only when the server preloads it; otherwise <see cref="TryEnableAsync"/> says no and the
/// breakdown is skipped). Executor time per statement, as PostgreSQL measures it; it includes waiting
/// for a core when the machine is busy.
/// </summary>
internal sealed class StatementStats(string connectionString)
{
    public async Task<bool> TryEnableAsync(CancellationToken ct)
    {
        try
        {
            await ExecuteAsync("CREATE EXTENSION IF NOT EXISTS pg_stat_statements", ct);
            await ResetAsync(ct);
            return true;
        }
        catch (PostgresException)
        {
            return false; // not in shared_preload_libraries
        }
    }

    public Task ResetAsync(CancellationToken ct) => ExecuteAsync("SELECT pg_stat_statements_reset()", ct);

    public async Task<IReadOnlyList<StatementKind>> ReadAsync(CancellationToken ct)
    {
        await using var connection = new NpgsqlConnection(connectionString);
        await connection.OpenAsync(ct);
        await using var command = new NpgsqlCommand(
            "SELECT query, calls, total_exec_time, rows FROM pg_stat_statements WHERE dbid = (SELECT oid FROM pg_database WHERE datname = current_database())",
            connection);
        var sums = new Dictionary<string, (long Calls, double Ms, long Rows)>(StringComparer.Ordinal);
        await using var reader = await command.ExecuteReaderAsync(ct);
        while (await reader.ReadAsync(ct))
        {
            var kind = Classify(reader.GetString(0));
            sums.TryGetValue(kind, out var s);
            sums[kind] = (s.Calls + reader.GetInt64(1), s.Ms + reader.GetDouble(2), s.Rows + reader.GetInt64(3));
        }

        return [.. sums.Select(p => new StatementKind(p.Key, p.Value.Calls, p.Value.Ms, p.Value.Rows)).OrderByDescending(k => k.TotalMs)];
    }

    // By the SQL text of src/DriftWatch/Sources/Postgres/PostgresPairSql.cs and PostgresPairSource.cs.
    private static string Classify(string query) => query switch
    {
        _ when query.Contains("corr(", StringComparison.Ordinal) => "push-down aggregate",
        _ when query.Contains("TABLESAMPLE", StringComparison.Ordinal) => "sample (tablesample)",
        _ when query.Contains("ORDER BY random()", StringComparison.Ordinal) => "sample (random)",
        _ when query.Contains("LIMIT 0", StringComparison.Ordinal) => "column probe",
        _ when query.Contains("reltuples", StringComparison.Ordinal) => "row estimate",
        _ when query.Contains("pg_stat_statements", StringComparison.Ordinal) => "benchmark's own",
        _ => "session (begin, settings, rollback)",
    };

    private async Task ExecuteAsync(string sql, CancellationToken ct)
    {
        await using var connection = new NpgsqlConnection(connectionString);
        await connection.OpenAsync(ct);
        await using var command = new NpgsqlCommand(sql, connection);
        await command.ExecuteNonQueryAsync(ct);
    }
}
