using System.Data.Common;
using Npgsql;

namespace DriftWatch.Store;

internal sealed class PostgresStoreDatabase : IStoreDatabase, IAsyncDisposable
{
    private readonly NpgsqlDataSource _dataSource;

    public PostgresStoreDatabase(string connectionString)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(connectionString);
        var builder = new NpgsqlConnectionStringBuilder(connectionString)
        {
            ApplicationName = "driftwatch-store",
        };
        _dataSource = NpgsqlDataSource.Create(builder);
    }

    public StoreDialect Dialect => StoreDialect.Postgres;

    public async Task<DbConnection> OpenAsync(CancellationToken cancellationToken) =>
        await _dataSource.OpenConnectionAsync(cancellationToken);

    public ValueTask DisposeAsync() => _dataSource.DisposeAsync();
}
