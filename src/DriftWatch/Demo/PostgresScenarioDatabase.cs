using Npgsql;
using NpgsqlTypes;

namespace DriftWatch.Demo;

/// <summary>
/// The scenario in the schema <see cref="Schema"/> of a PostgreSQL database given on the command line.
/// A previous demo's schema is recognised by its marker table and replaced; any other schema of that name is
/// left alone and the demo refuses to run. Rows go in by binary COPY.
/// </summary>
internal sealed class PostgresScenarioDatabase : IScenarioDatabase
{
    public const string Schema = "terminal";
    public const string MarkerTable = "driftwatch_demo";

    private readonly NpgsqlDataSource _dataSource;

    private PostgresScenarioDatabase(NpgsqlDataSource dataSource, string describe)
    {
        _dataSource = dataSource;
        Describe = describe;
    }

    public string Describe { get; }

    /// <summary>Opens the database; throws <see cref="DemoException"/> for a bad connection string or an unreachable server.</summary>
    public static async Task<PostgresScenarioDatabase> OpenAsync(string connectionString, CancellationToken cancellationToken)
    {
        NpgsqlConnectionStringBuilder builder;
        try
        {
            builder = new NpgsqlConnectionStringBuilder(connectionString);
        }
        catch (ArgumentException)
        {
            // The message could quote the password: say which setting, not its value.
            throw new DemoException("--postgres is not a valid Npgsql connection string (value hidden).");
        }

        var describe = $"PostgreSQL schema {Schema} in database {builder.Database ?? "(default)"} on {builder.Host}:{builder.Port}";
        var dataSource = NpgsqlDataSource.Create(builder.ConnectionString);
        try
        {
            await using var connection = await dataSource.OpenConnectionAsync(cancellationToken);
            return new PostgresScenarioDatabase(dataSource, describe);
        }
        catch (Exception ex) when (ex is NpgsqlException or TimeoutException)
        {
            await dataSource.DisposeAsync();
            throw new DemoException($"cannot connect to {describe}: {ex.Message}");
        }
    }

    public async Task CreateAsync(IReadOnlyList<ScenarioPair> pairs, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pairs);
        await using var connection = await _dataSource.OpenConnectionAsync(cancellationToken);
        var schemaExists = await ScalarAsync<bool>(connection, $"SELECT EXISTS (SELECT 1 FROM pg_namespace WHERE nspname = '{Schema}')", cancellationToken);
        if (schemaExists)
        {
            var marked = await ScalarAsync<bool>(connection, $"SELECT to_regclass('{Schema}.{MarkerTable}') IS NOT NULL", cancellationToken);
            if (!marked)
            {
                throw new DemoException(
                    $"{Describe} already exists and is not a previous demo's (it has no table {Schema}.{MarkerTable}); " +
                    "the demo does not drop it. Use another database, or drop the schema yourself.");
            }
        }

        await using var transaction = await connection.BeginTransactionAsync(cancellationToken);
        var sql = new List<string>
        {
            $"DROP SCHEMA IF EXISTS {Schema} CASCADE",
            $"CREATE SCHEMA {Schema}",
            $"CREATE TABLE {Schema}.{MarkerTable} (created_at timestamptz NOT NULL DEFAULT now(), note text NOT NULL)",
            $"INSERT INTO {Schema}.{MarkerTable} (note) VALUES ('invented data of the DriftWatch demo ({TerminalScenario.TerminalName}); safe to drop')",
        };
        foreach (var pair in pairs)
        {
            sql.Add($"CREATE TABLE {Schema}.{pair.Table} (id bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY, {pair.TimeColumn} timestamptz NOT NULL, {pair.X} double precision, {pair.Y} double precision)");
            sql.Add($"CREATE INDEX ON {Schema}.{pair.Table} ({pair.TimeColumn})");
        }

        foreach (var statement in sql)
        {
            await using var command = new NpgsqlCommand(statement, connection, transaction);
            await command.ExecuteNonQueryAsync(cancellationToken);
        }

        await transaction.CommitAsync(cancellationToken);
    }

    public async Task LoadAsync(ScenarioPair pair, string table, IReadOnlyList<ScenarioRow> rows, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        ArgumentNullException.ThrowIfNull(rows);
        await using var connection = await _dataSource.OpenConnectionAsync(cancellationToken);
        await using (var import = await connection.BeginBinaryImportAsync(
            $"COPY {Schema}.{table} ({pair.TimeColumn}, {pair.X}, {pair.Y}) FROM STDIN (FORMAT BINARY)", cancellationToken))
        {
            foreach (var row in rows)
            {
                await import.StartRowAsync(cancellationToken);
                await import.WriteAsync(row.At.UtcDateTime, NpgsqlDbType.TimestampTz, cancellationToken);
                await import.WriteAsync(row.X, NpgsqlDbType.Double, cancellationToken);
                await import.WriteAsync(row.Y, NpgsqlDbType.Double, cancellationToken);
            }

            await import.CompleteAsync(cancellationToken);
        }

        // Fresh statistics, as a nightly load's ANALYZE would leave them; the source sizes samples from them.
        await using var analyze = new NpgsqlCommand($"ANALYZE {Schema}.{table}", connection);
        await analyze.ExecuteNonQueryAsync(cancellationToken);
    }

    public async Task RenameTableAsync(string from, string to, CancellationToken cancellationToken)
    {
        await using var connection = await _dataSource.OpenConnectionAsync(cancellationToken);
        await using var command = new NpgsqlCommand($"ALTER TABLE {Schema}.{from} RENAME TO {to}", connection);
        await command.ExecuteNonQueryAsync(cancellationToken);
    }

    public ValueTask DisposeAsync() => _dataSource.DisposeAsync();

    private static async Task<T> ScalarAsync<T>(NpgsqlConnection connection, string sql, CancellationToken cancellationToken)
    {
        await using var command = new NpgsqlCommand(sql, connection);
        return (T)(await command.ExecuteScalarAsync(cancellationToken))!;
    }
}
