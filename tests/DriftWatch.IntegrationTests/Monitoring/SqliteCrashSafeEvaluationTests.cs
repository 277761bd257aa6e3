using DriftWatch.IntegrationTests.Alerting;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Monitoring;

/// <summary>Crash-safe alert evaluation on SQLite, in a temporary file.</summary>
public sealed class SqliteCrashSafeEvaluationTests : CrashSafeEvaluationContract
{
    private readonly TemporarySqliteStore _file = new();

    private protected override async Task<IStoreDatabase> DatabaseAsync() => await _file.OpenAsync();

    protected override void Dispose(bool disposing)
    {
        _file.Dispose();
        base.Dispose(disposing);
    }
}
