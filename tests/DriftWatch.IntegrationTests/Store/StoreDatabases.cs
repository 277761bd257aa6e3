using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.IntegrationTests.Sources.Sqlite;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Store;

/// <summary>A fresh, empty store database of one dialect, removed on dispose; store tests run once per dialect.</summary>
internal interface IStoreDatabaseFactory : IAsyncDisposable
{
    Task<IStoreDatabase> CreateAsync();
}

internal sealed class SqliteStoreDatabaseFactory : IStoreDatabaseFactory
{
    private readonly List<SqliteFile> _files = [];

    public Task<IStoreDatabase> CreateAsync()
    {
        var file = new SqliteFile();
        _files.Add(file);
        return Task.FromResult<IStoreDatabase>(new SqliteStoreDatabase($"Data Source={file.Path}"));
    }

    public ValueTask DisposeAsync()
    {
        Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
        foreach (var file in _files)
        {
            file.Dispose();
        }

        return ValueTask.CompletedTask;
    }
}

internal sealed class PostgresStoreDatabaseFactory(PostgresServer server) : IStoreDatabaseFactory
{
    private readonly List<(PostgresStoreDatabase Database, string ConnectionString)> _databases = [];

    public async Task<IStoreDatabase> CreateAsync()
    {
        var cs = await server.CreateDatabaseAsync();
        var database = new PostgresStoreDatabase(cs);
        _databases.Add((database, cs));
        return database;
    }

    public async ValueTask DisposeAsync()
    {
        foreach (var (database, cs) in _databases)
        {
            await database.DisposeAsync();
            await server.DropDatabaseAsync(cs);
        }
    }
}
