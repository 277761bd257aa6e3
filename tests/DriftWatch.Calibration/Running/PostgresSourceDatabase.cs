using System.Globalization;
using DriftWatch.Calibration.Generation;
using Npgsql;
using NpgsqlTypes;

namespace DriftWatch.Calibration.Running;

/// <summary>
/// The source as a new PostgreSQL database on the server of <see cref="CalibrationOptions.PostgresVariable"/>,
/// dropped at the end. Each day's rows go in by binary COPY; tables are analysed after each load, as autovacuum
/// would have done on a settled table, so the sample planner sees row estimates.
/// </summary>
internal sealed class PostgresSourceDatabase : ISourceDatabase
{
    public const string ConnectionVariable = "DRIFTWATCH_CALIBRATION_SOURCE";

    private readonly string _admin;
    private readonly string _database;
    private readonly NpgsqlDataSource _source;

    private PostgresSourceDatabase(string admin, string database, string connectionString)
    {
        _admin = admin;
        _database = database;
        _source = NpgsqlDataSource.Create(connectionString);
        Environment = new Dictionary<string, string> { [ConnectionVariable] = connectionString };
    }

    public string Describe => $"PostgreSQL database {_database} (dropped at the end)";

    public string SourceYaml => $"    kind: postgres\n    connection: ${{{ConnectionVariable}}}\n";

    public IReadOnlyDictionary<string, string> Environment { get; }

    public static async Task<PostgresSourceDatabase> CreateDatabaseAsync(string admin, CancellationToken cancellationToken)
    {
        var name = string.Create(CultureInfo.InvariantCulture, $"driftwatch_calibration_{System.Environment.ProcessId}_{DateTime.UtcNow:HHmmss}");
        await using (var connection = new NpgsqlConnection(admin))
        {
            await connection.OpenAsync(cancellationToken);
            await using var create = new NpgsqlCommand($"CREATE DATABASE {name}", connection);
            await create.ExecuteNonQueryAsync(cancellationToken);
        }

        var builder = new NpgsqlConnectionStringBuilder(admin) { Database = name };
        return new PostgresSourceDatabase(admin, name, builder.ConnectionString);
    }

    public async Task CreateAsync(IReadOnlyList<CalibrationPair> pairs, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pairs);
        await using var connection = await _source.OpenConnectionAsync(cancellationToken);
        foreach (var pair in pairs)
        {
            await using var command = new NpgsqlCommand(
                $"""
                CREATE TABLE {pair.Table} (id bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY, {CalibrationPair.TimeColumn} timestamptz NOT NULL,
                    {CalibrationPair.XColumn} double precision, {CalibrationPair.YColumn} double precision);
                CREATE INDEX {pair.Table}_{CalibrationPair.TimeColumn} ON {pair.Table} ({CalibrationPair.TimeColumn});
                """,
                connection);
            await command.ExecuteNonQueryAsync(cancellationToken);
        }
    }

    public async Task LoadAsync(CalibrationPair pair, DateOnly date, IReadOnlyList<CalibrationRow> rows, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pair);
        ArgumentNullException.ThrowIfNull(rows);
        await using var connection = await _source.OpenConnectionAsync(cancellationToken);
        await using var transaction = await connection.BeginTransactionAsync(cancellationToken);
        if (pair.Storage == StorageStyle.Replaced)
        {
            await using var truncate = new NpgsqlCommand($"TRUNCATE {pair.Table}", connection, transaction);
            await truncate.ExecuteNonQueryAsync(cancellationToken);
        }

        await using (var copy = await connection.BeginBinaryImportAsync(
            $"COPY {pair.Table} ({CalibrationPair.TimeColumn}, {CalibrationPair.XColumn}, {CalibrationPair.YColumn}) FROM STDIN (FORMAT BINARY)", cancellationToken))
        {
            for (var i = 0; i < rows.Count; i++)
            {
                await copy.StartRowAsync(cancellationToken);
                await copy.WriteAsync(LoadTimes.Of(date, i, rows.Count), NpgsqlDbType.TimestampTz, cancellationToken);
                await WriteAsync(copy, rows[i].X, cancellationToken);
                await WriteAsync(copy, rows[i].Y, cancellationToken);
            }

            await copy.CompleteAsync(cancellationToken);
        }

        await transaction.CommitAsync(cancellationToken);
        await using var analyze = new NpgsqlCommand($"ANALYZE {pair.Table}", connection);
        await analyze.ExecuteNonQueryAsync(cancellationToken);
    }

    public async ValueTask DisposeAsync()
    {
        await _source.DisposeAsync();
        NpgsqlConnection.ClearAllPools();
        await using var connection = new NpgsqlConnection(_admin);
        await connection.OpenAsync();
        await using var drop = new NpgsqlCommand($"DROP DATABASE IF EXISTS {_database} WITH (FORCE)", connection);
        await drop.ExecuteNonQueryAsync();
    }

    private static Task WriteAsync(NpgsqlBinaryImporter copy, double? value, CancellationToken cancellationToken) =>
        value is { } v ? copy.WriteAsync(v, NpgsqlDbType.Double, cancellationToken) : copy.WriteNullAsync(cancellationToken);
}
