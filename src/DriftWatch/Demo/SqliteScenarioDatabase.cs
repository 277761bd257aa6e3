using System.Globalization;
using Microsoft.Data.Sqlite;

namespace DriftWatch.Demo;

/// <summary>
/// The scenario in a SQLite file inside the demo folder. Times are stored as ISO-8601 UTC text
/// ("2026-11-08 14:03:12"), one of the two forms the SQLite source reads a window column in.
/// </summary>
internal sealed class SqliteScenarioDatabase : IScenarioDatabase
{
    public const string TimeFormat = "yyyy-MM-dd HH:mm:ss";

    private readonly SqliteConnection _connection;

    private SqliteScenarioDatabase(string path, SqliteConnection connection)
    {
        Path = path;
        _connection = connection;
    }

    public string Path { get; }

    public string Describe => $"SQLite file {Path}";

    /// <summary>Opens (creating) the file; the demo folder is new, so the file is too.</summary>
    public static async Task<SqliteScenarioDatabase> OpenAsync(string path, CancellationToken cancellationToken)
    {
        var builder = new SqliteConnectionStringBuilder { DataSource = path, Mode = SqliteOpenMode.ReadWriteCreate, Pooling = false };
        var connection = new SqliteConnection(builder.ToString());
        try
        {
            await connection.OpenAsync(cancellationToken);
            await using (var pragma = connection.CreateCommand())
            {
                // Invented data in a throwaway file: no need to wait for the disk after every day's load.
                pragma.CommandText = "PRAGMA synchronous = OFF";
                await pragma.ExecuteNonQueryAsync(cancellationToken);
            }

            return new SqliteScenarioDatabase(path, connection);
        }
        catch
        {
            await connection.DisposeAsync();
            throw;
        }
    }

    public async Task CreateAsync(IReadOnlyList<ScenarioPair> pairs, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pairs);
        foreach (var pair in pairs)
        {
            await ExecuteAsync(
                $"""
                CREATE TABLE {pair.Table} (
                    id INTEGER PRIMARY KEY,
                    {pair.TimeColumn} TEXT NOT NULL,
                    {pair.X} REAL,
                    {pair.Y} REAL);
                CREATE INDEX {pair.Table}_{pair.TimeColumn} ON {pair.Table} ({pair.TimeColumn});
                """,
                cancellationToken);
        }
    }

    public async Task LoadAsync(ScenarioPair pair, string table, IReadOnlyList<ScenarioRow> rows, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        ArgumentNullException.ThrowIfNull(rows);
        await using var transaction = (SqliteTransaction)await _connection.BeginTransactionAsync(cancellationToken);
        await using var command = _connection.CreateCommand();
        command.Transaction = transaction;
        command.CommandText = $"INSERT INTO {table} ({pair.TimeColumn}, {pair.X}, {pair.Y}) VALUES (@t, @x, @y)";
        var at = command.Parameters.Add("@t", SqliteType.Text);
        var x = command.Parameters.Add("@x", SqliteType.Real);
        var y = command.Parameters.Add("@y", SqliteType.Real);
        await command.PrepareAsync(cancellationToken);
        foreach (var row in rows)
        {
            at.Value = row.At.UtcDateTime.ToString(TimeFormat, CultureInfo.InvariantCulture);
            x.Value = row.X;
            y.Value = row.Y;
            await command.ExecuteNonQueryAsync(cancellationToken);
        }

        await transaction.CommitAsync(cancellationToken);
    }

    public Task RenameTableAsync(string from, string to, CancellationToken cancellationToken) =>
        ExecuteAsync($"ALTER TABLE {from} RENAME TO {to}", cancellationToken);

    public ValueTask DisposeAsync() => _connection.DisposeAsync();

    private async Task ExecuteAsync(string sql, CancellationToken cancellationToken)
    {
        await using var command = _connection.CreateCommand();
        command.CommandText = sql;
        await command.ExecuteNonQueryAsync(cancellationToken);
    }
}
