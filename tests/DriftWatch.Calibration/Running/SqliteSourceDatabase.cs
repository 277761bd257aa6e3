using System.Globalization;
using DriftWatch.Calibration.Generation;
using Microsoft.Data.Sqlite;

namespace DriftWatch.Calibration.Running;

/// <summary>
/// The source as a SQLite file in the run's folder. Load times are Unix seconds (an integer column), one of the
/// forms the SQLite source reads a window column in. One transaction and one prepared command per table per day.
/// </summary>
internal sealed class SqliteSourceDatabase : ISourceDatabase
{
    public const string File = "source.db";

    private readonly SqliteConnection _connection;

    private SqliteSourceDatabase(string path, SqliteConnection connection)
    {
        Describe = $"SQLite file {path}";
        _connection = connection;
    }

    public string Describe { get; }

    public string SourceYaml => $"    kind: sqlite\n    connection: {File}\n";

    public IReadOnlyDictionary<string, string> Environment { get; } = new Dictionary<string, string>();

    public static async Task<SqliteSourceDatabase> OpenAsync(string folder, CancellationToken cancellationToken)
    {
        var path = Path.Combine(folder, File);
        var builder = new SqliteConnectionStringBuilder { DataSource = path, Mode = SqliteOpenMode.ReadWriteCreate, Pooling = false };
        var connection = new SqliteConnection(builder.ToString());
        try
        {
            await connection.OpenAsync(cancellationToken);
            await using var pragma = connection.CreateCommand();

            // A throwaway file: no waiting for the disk. WAL lets the checks read while nothing is written.
            pragma.CommandText = "PRAGMA journal_mode = WAL; PRAGMA synchronous = OFF;";
            await pragma.ExecuteNonQueryAsync(cancellationToken);
            return new SqliteSourceDatabase(path, connection);
        }
        catch
        {
            await connection.DisposeAsync();
            throw;
        }
    }

    public async Task CreateAsync(IReadOnlyList<CalibrationPair> pairs, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pairs);
        foreach (var pair in pairs)
        {
            await using var command = _connection.CreateCommand();
            command.CommandText = string.Create(CultureInfo.InvariantCulture, $"""
                CREATE TABLE {pair.Table} (id INTEGER PRIMARY KEY, {CalibrationPair.TimeColumn} INTEGER NOT NULL, {CalibrationPair.XColumn} REAL, {CalibrationPair.YColumn} REAL);
                CREATE INDEX {pair.Table}_{CalibrationPair.TimeColumn} ON {pair.Table} ({CalibrationPair.TimeColumn});
                """);
            await command.ExecuteNonQueryAsync(cancellationToken);
        }
    }

    public async Task LoadAsync(CalibrationPair pair, DateOnly date, IReadOnlyList<CalibrationRow> rows, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        ArgumentNullException.ThrowIfNull(rows);
        await using var transaction = (SqliteTransaction)await _connection.BeginTransactionAsync(cancellationToken);
        if (pair.Storage == StorageStyle.Replaced)
        {
            await using var delete = _connection.CreateCommand();
            delete.Transaction = transaction;
            delete.CommandText = $"DELETE FROM {pair.Table}";
            await delete.ExecuteNonQueryAsync(cancellationToken);
        }

        await using var command = _connection.CreateCommand();
        command.Transaction = transaction;
        command.CommandText = $"INSERT INTO {pair.Table} ({CalibrationPair.TimeColumn}, {CalibrationPair.XColumn}, {CalibrationPair.YColumn}) VALUES (@t, @x, @y)";
        var at = command.Parameters.Add("@t", SqliteType.Integer);
        var x = command.Parameters.Add("@x", SqliteType.Real);
        var y = command.Parameters.Add("@y", SqliteType.Real);
        command.Prepare();
        for (var i = 0; i < rows.Count; i++)
        {
            at.Value = LoadTimes.Of(date, i, rows.Count).ToUnixTimeSeconds();
            x.Value = rows[i].X is { } xv ? xv : DBNull.Value;
            y.Value = rows[i].Y is { } yv ? yv : DBNull.Value;

            // Synchronous on purpose: Microsoft.Data.Sqlite has no asynchronous I/O, and the async wrapper costs per row.
            command.ExecuteNonQuery();
        }

        await transaction.CommitAsync(cancellationToken);
    }

    public ValueTask DisposeAsync() => _connection.DisposeAsync();
}
