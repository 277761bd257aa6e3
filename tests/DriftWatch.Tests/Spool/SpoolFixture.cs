using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;
using DriftWatch.Spool;
using DriftWatch.Store;
using Microsoft.Data.Sqlite;

namespace DriftWatch.Tests.Spool;

/// <summary>A spool folder and a migrated SQLite store, both in a fresh temporary folder.</summary>
internal sealed class SpoolFixture : IDisposable
{
    public static readonly DateTimeOffset T0 = new(2026, 11, 30, 8, 0, 0, TimeSpan.Zero);

    public SpoolFixture(int maxRuns = 100, long maxBytes = 64L * 1024 * 1024)
    {
        Folder = Path.Combine(Path.GetTempPath(), "dw-spool-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(Folder);
        Options = new SpoolOptions(Path.Combine(Folder, "spool"), maxRuns, maxBytes);
        Database = new SqliteStoreDatabase($"Data Source={Path.Combine(Folder, "store.db")}");
        new MigrationRunner(Database).MigrateAsync(CancellationToken.None).GetAwaiter().GetResult();
        Store = new HistoryStore(Database);
    }

    public string Folder { get; }

    public SpoolOptions Options { get; }

    public SqliteStoreDatabase Database { get; }

    public HistoryStore Store { get; }

    public ListLogger<RunSpool> SpoolLog { get; } = new();

    /// <summary>A new spool object over the same folder: what a restarted worker sees.</summary>
    public RunSpool OpenSpool() => new(Options, SpoolLog);

    /// <summary>
    /// A run with a real profile, one finding, figures and points, from Anscombe's quartet set I
    /// (Anscombe 1973, values from memory); <paramref name="hour"/> sets its start.
    /// </summary>
    public static NewRun Run(string pair, int hour, string? key = null)
    {
        var sample = new PairedSample(
            [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5],
            [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68]);
        var profile = Profiler.Profile(sample, Thresholds.Default);
        return new NewRun(
            pair,
            T0.AddHours(hour),
            T0.AddHours(hour).AddSeconds(2),
            RunStatus.Succeeded,
            null,
            profile,
            [new Finding(FindingKind.SlopeShift, Severity.Warning, 0.004, double.NaN, $"run {hour}")],
            new SourceFigures(11, 11, 0, profile.PearsonR, profile.Slope, profile.Intercept, 9, 7.5, 11, 4.1),
            sample,
            "all rows")
        {
            RunKey = key ?? Guid.NewGuid().ToString("N"),
        };
    }

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        Directory.Delete(Folder, recursive: true);
    }
}
