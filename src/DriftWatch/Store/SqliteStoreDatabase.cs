using System.Data.Common;
using Microsoft.Data.Sqlite;

namespace DriftWatch.Store;

internal sealed class SqliteStoreDatabase : IStoreDatabase
{
    private readonly string _connectionString;

    public SqliteStoreDatabase(string connectionString)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(connectionString);
        var builder = new SqliteConnectionStringBuilder(connectionString)
        {
            Mode = SqliteOpenMode.ReadWriteCreate,
            Pooling = true,
        };
        var directory = Path.GetDirectoryName(Path.GetFullPath(builder.DataSource));
        if (!string.IsNullOrEmpty(directory) && builder.DataSource != ":memory:")
        {
            Directory.CreateDirectory(directory);
        }

        _connectionString = builder.ToString();
    }

    public StoreDialect Dialect => StoreDialect.Sqlite;

    public async Task<DbConnection> OpenAsync(CancellationToken cancellationToken)
    {
        var connection = new SqliteConnection(_connectionString);
        try
        {
            await connection.OpenAsync(cancellationToken);
            // WAL lets the dashboard read while the worker writes; busy_timeout waits out a writer instead of failing.
            await using var pragma = connection.CreateCommand();
            pragma.CommandText = "PRAGMA journal_mode=WAL; PRAGMA busy_timeout=10000; PRAGMA foreign_keys=ON;";
            await pragma.ExecuteNonQueryAsync(cancellationToken);
            return connection;
        }
        catch
        {
            await connection.DisposeAsync();
            throw;
        }
    }
}
