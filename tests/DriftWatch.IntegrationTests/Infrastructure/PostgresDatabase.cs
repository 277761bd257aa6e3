using Npgsql;

namespace DriftWatch.IntegrationTests.Infrastructure;

/// <summary>One test's own database on the shared server: created on demand, dropped on dispose.</summary>
public sealed class PostgresDatabase : IAsyncDisposable
{
    private readonly PostgresServer _server;

    private PostgresDatabase(PostgresServer server, string connectionString)
    {
        _server = server;
        ConnectionString = connectionString;
    }

    public string ConnectionString { get; }

    public static async Task<PostgresDatabase> CreateAsync(PostgresServer server, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(server);
        return new PostgresDatabase(server, await server.CreateDatabaseAsync(cancellationToken));
    }

    public async Task ExecuteAsync(string sql, CancellationToken cancellationToken = default)
    {
        await using var connection = new NpgsqlConnection(ConnectionString);
        await connection.OpenAsync(cancellationToken);
        await using var command = new NpgsqlCommand(sql, connection);
        await command.ExecuteNonQueryAsync(cancellationToken);
    }

    public async Task<T> ScalarAsync<T>(string sql, CancellationToken cancellationToken = default)
    {
        await using var connection = new NpgsqlConnection(ConnectionString);
        await connection.OpenAsync(cancellationToken);
        await using var command = new NpgsqlCommand(sql, connection);
        var value = await command.ExecuteScalarAsync(cancellationToken);
        return (T)Convert.ChangeType(value!, typeof(T), System.Globalization.CultureInfo.InvariantCulture);
    }

    /// <summary>Rows of a query as nullable doubles, in the query's order.</summary>
    public async Task<List<double?[]>> RowsAsync(string sql, CancellationToken cancellationToken = default)
    {
        await using var connection = new NpgsqlConnection(ConnectionString);
        await connection.OpenAsync(cancellationToken);
        await using var command = new NpgsqlCommand(sql, connection);
        await using var reader = await command.ExecuteReaderAsync(cancellationToken);
        var rows = new List<double?[]>();
        while (await reader.ReadAsync(cancellationToken))
        {
            var row = new double?[reader.FieldCount];
            for (var i = 0; i < row.Length; i++)
            {
                row[i] = reader.IsDBNull(i) ? null : Convert.ToDouble(reader.GetValue(i), System.Globalization.CultureInfo.InvariantCulture);
            }

            rows.Add(row);
        }

        return rows;
    }

    public ValueTask DisposeAsync() => new(_server.DropDatabaseAsync(ConnectionString));
}
