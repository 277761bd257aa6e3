using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Monitoring;

/// <summary>Crash-safe alert evaluation on a real PostgreSQL server, one fresh database per test.</summary>
[Collection(UsesPostgres.Name)]
public sealed class PostgresCrashSafeEvaluationTests(PostgresServer server) : CrashSafeEvaluationContract, IAsyncLifetime
{
    private readonly List<PostgresStoreDatabase> _handles = [];
    private PostgresDatabase? _database;

    public async Task InitializeAsync() => _database = await PostgresDatabase.CreateAsync(server);

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

    private protected override async Task<IStoreDatabase> DatabaseAsync()
    {
        var handle = new PostgresStoreDatabase(_database!.ConnectionString);
        _handles.Add(handle);
        await new MigrationRunner(handle).MigrateAsync(CancellationToken.None);
        return handle;
    }
}
