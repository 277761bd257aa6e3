using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>A real SQLite store in a temporary file, migrated; deleted afterwards.</summary>
internal sealed class TemporarySqliteStore : IDisposable
{
    private readonly string _directory = Path.Combine(Path.GetTempPath(), "dw-alerts-" + Guid.NewGuid().ToString("N"));

    public TemporarySqliteStore()
    {
        Directory.CreateDirectory(_directory);
        DatabasePath = Path.Combine(_directory, "driftwatch.db");
    }

    public string DatabasePath { get; }

    public string Folder => _directory;

    /// <summary>A new database object over the same file: what a restarted worker gets.</summary>
    public async Task<SqliteStoreDatabase> OpenAsync()
    {
        var database = new SqliteStoreDatabase($"Data Source={DatabasePath}");
        await new MigrationRunner(database).MigrateAsync(CancellationToken.None);
        return database;
    }

    public void Dispose()
    {
        Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
        try
        {
            Directory.Delete(_directory, recursive: true);
        }
        catch (IOException)
        {
            // A file still held open by a pooled connection elsewhere; the temp folder is cleaned by the OS.
        }
    }
}
