using Dapper;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Store;

/// <summary>
/// Migration 004 on a store last migrated by an older release (scripts 001–003 only): runs.status accepts
/// 'unmeasurable', and the runs, their findings, the index, the id sequence and the cascade are kept. Checked
/// against the database's own catalogue (sqlite_master, pg_indexes) and its own constraint enforcement.
/// </summary>
public abstract class UnmeasurableMigrationContract : IAsyncLifetime
{
    private static readonly DateTimeOffset T0 = new(2026, 3, 1, 8, 0, 0, TimeSpan.Zero);

    private readonly IStoreDatabaseFactory _factory;

    private protected UnmeasurableMigrationContract(IStoreDatabaseFactory factory) => _factory = factory;

    private IStoreDatabase Database { get; set; } = null!;

    public async Task InitializeAsync()
    {
        Database = await _factory.CreateAsync();

        // An old store: the scripts before 004, applied and recorded as that release's runner did.
        await using var connection = await Database.OpenAsync(CancellationToken.None);
        await connection.ExecuteAsync("CREATE TABLE schema_migrations (version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at_ms BIGINT NOT NULL)");
        foreach (var script in MigrationRunner.LoadScripts(Database.Dialect).Where(s => s.Version < 4))
        {
            await connection.ExecuteAsync(script.Sql);
            await connection.ExecuteAsync("INSERT INTO schema_migrations (version, name, applied_at_ms) VALUES (@Version, @Name, 0)", new { script.Version, script.Name });
        }
    }

    public async Task DisposeAsync() => await _factory.DisposeAsync();

    [Fact]
    public async Task Migrate_OldStore_KeepsRunsFindingsIndexAndIdsAndAcceptsUnmeasurable()
    {
        var old = new HistoryStore(Database);
        var kept = await old.RecordRunAsync(HistoryStoreContract.Run("orders", T0, findings: [new(Core.Findings.FindingKind.SlopeShift, Core.Findings.Severity.Warning, 0.001, 1.2, "slope moved")]), CancellationToken.None);
        var failed = await old.RecordRunAsync(HistoryStoreContract.Run("orders", T0.AddHours(1), status: RunStatus.Failed), CancellationToken.None);
        var pruned = await old.RecordRunAsync(HistoryStoreContract.Run("orders", T0.AddHours(2)), CancellationToken.None);
        await using (var connection = await Database.OpenAsync(CancellationToken.None))
        {
            // The old CHECK refuses the new status: this is what 004 is for.
            await Assert.ThrowsAnyAsync<Exception>(() => connection.ExecuteAsync(
                "INSERT INTO runs (pair, started_at_ms, finished_at_ms, status) VALUES ('orders', 1, 2, 'unmeasurable')"));
            await connection.ExecuteAsync("DELETE FROM runs WHERE id = @pruned", new { pruned });
        }

        var applied = await new MigrationRunner(Database).MigrateAsync(CancellationToken.None);

        Assert.Contains("004_unmeasurable_runs", applied);
        Assert.DoesNotContain(applied, a => a.StartsWith("001", StringComparison.Ordinal) || a.StartsWith("003", StringComparison.Ordinal));
        var store = new HistoryStore(Database);
        var before = (await store.GetRunAsync(kept, includePoints: true, CancellationToken.None))!;
        Assert.Equal(RunStatus.Succeeded, before.Status);
        Assert.Equal("slope moved", Assert.Single(before.Findings).Message);
        Assert.Equal(250, before.Points!.UsedCount); // under the default points_per_run, so all kept
        Assert.Equal(RunStatus.Failed, (await store.GetRunAsync(failed, includePoints: false, CancellationToken.None))!.Status);

        // Ids keep rising past the pruned run: the alert watermark is a run id.
        var profile = Profiler.Profile(PairedSample.Empty, Core.Statistics.Thresholds.Default);
        var empty = await store.RecordRunAsync(
            new NewRun("orders", T0.AddHours(3), T0.AddHours(3).AddSeconds(1), RunStatus.Unmeasurable, "No rows in the window.", profile, [], new SourceFigures(0, 0, 0, null, null, null, null, null, null, null), null, "all"),
            CancellationToken.None);
        Assert.True(empty > pruned, $"new id {empty} must exceed the pruned {pruned}");
        var stored = (await store.GetRunAsync(empty, includePoints: true, CancellationToken.None))!;
        Assert.Equal(RunStatus.Unmeasurable, stored.Status);
        Assert.Equal("No rows in the window.", stored.Error);
        Assert.Equal(0, stored.Profile!.NRows);
        Assert.Equal(0, stored.SourceFigures!.RowCount);
        Assert.Null(stored.Points);

        await using var check = await Database.OpenAsync(CancellationToken.None);
        Assert.Equal(1, await check.ExecuteScalarAsync<int>(Database.Dialect == StoreDialect.Sqlite
            ? "SELECT COUNT(*) FROM sqlite_master WHERE type = 'index' AND name = 'ix_runs_pair_started' AND tbl_name = 'runs'"
            : "SELECT COUNT(*) FROM pg_indexes WHERE indexname = 'ix_runs_pair_started' AND tablename = 'runs'"));
        await Assert.ThrowsAnyAsync<Exception>(() => check.ExecuteAsync(
            "INSERT INTO runs (pair, started_at_ms, finished_at_ms, status) VALUES ('orders', 1, 2, 'skipped')"));
        // The findings' foreign key still points at runs and still cascades.
        await check.ExecuteAsync("DELETE FROM runs WHERE id = @kept", new { kept });
        Assert.Equal(0, await check.ExecuteScalarAsync<int>("SELECT COUNT(*) FROM findings"));
        await Assert.ThrowsAnyAsync<Exception>(() => check.ExecuteAsync(
            "INSERT INTO findings (run_id, pair, kind, severity, message) VALUES (987654, 'orders', 'slope_shift', 'warning', 'orphan')"));
    }
}

public sealed class SqliteUnmeasurableMigrationTests() : UnmeasurableMigrationContract(new SqliteStoreDatabaseFactory());

[Collection(UsesPostgres.Name)]
public sealed class PostgresUnmeasurableMigrationTests(PostgresServer server) : UnmeasurableMigrationContract(new PostgresStoreDatabaseFactory(server));
