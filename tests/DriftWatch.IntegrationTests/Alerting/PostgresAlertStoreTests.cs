using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>The alert store contract on a real PostgreSQL server, one fresh database per test.</summary>
[Collection(UsesPostgres.Name)]
public sealed class PostgresAlertStoreTests(PostgresServer server) : AlertStoreContract, IAsyncLifetime
{
    private readonly List<PostgresStoreDatabase> _handles = [];
    private PostgresDatabase? _database;

    public async Task InitializeAsync() => _database = await PostgresDatabase.CreateAsync(server);

    private protected override Task<IStoreDatabase> DatabaseAsync() => OpenAsync();

    private protected override Task<IStoreDatabase> ReopenAsync() => OpenAsync();

    public async Task DisposeAsync()
    {
        foreach (var handle in _handles)
        {
            await handle.DisposeAsync();
        }

        if (_database is not null)
        {
            await _database.DisposeAsync();
        }
    }

    private async Task<IStoreDatabase> OpenAsync()
    {
        var handle = new PostgresStoreDatabase(_database!.ConnectionString);
        _handles.Add(handle);
        await new MigrationRunner(handle).MigrateAsync(CancellationToken.None);
        return handle;
    }
}
