using DriftWatch.Core.Configuration;

namespace DriftWatch.Store;

/// <summary>Opens DriftWatch's own store from its configuration and brings the schema up to date.</summary>
internal static class StoreFactory
{
    /// <summary>The database for the configured kind; not yet migrated. Dispose it if it is <see cref="IAsyncDisposable"/>.</summary>
    public static IStoreDatabase CreateDatabase(StoreConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        return config.Kind switch
        {
            StoreKind.Sqlite => new SqliteStoreDatabase(config.ConnectionString),
            StoreKind.Postgres => new PostgresStoreDatabase(config.ConnectionString),
            _ => throw new ArgumentOutOfRangeException(nameof(config), config.Kind, "Unknown store kind."),
        };
    }

    /// <summary>Creates the database and applies the migrations not yet applied (safe at every start, from several instances).</summary>
    public static async Task<IStoreDatabase> OpenAsync(StoreConfig config, CancellationToken cancellationToken)
    {
        var database = CreateDatabase(config);
        try
        {
            await new MigrationRunner(database).MigrateAsync(cancellationToken);
            return database;
        }
        catch
        {
            if (database is IAsyncDisposable disposable)
            {
                await disposable.DisposeAsync();
            }

            throw;
        }
    }

    public static HistoryStore CreateHistoryStore(IStoreDatabase database, StoreConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        return new HistoryStore(database, config.PointsPerRun);
    }
}
