using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>The alert store contract on SQLite, in a temporary file.</summary>
public sealed class SqliteAlertStoreTests : AlertStoreContract, IDisposable
{
    private readonly TemporarySqliteStore _file = new();

    private protected override async Task<IStoreDatabase> DatabaseAsync() => await _file.OpenAsync();

    private protected override async Task<IStoreDatabase> ReopenAsync() => await _file.OpenAsync();

    public void Dispose() => _file.Dispose();
}
