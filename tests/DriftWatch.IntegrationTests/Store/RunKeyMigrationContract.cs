using Dapper;
using DriftWatch.Core.History;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Store;

/// <summary>
/// Migration 009 on a store last migrated by an older release (scripts up to 008): runs, findings, baselines'
/// judgement and ids are kept; runs.status accepts 'interrupted'; a run key is stored at most once (the database's
/// own unique index refuses a second row, and the history store returns the first run's id).
/// </summary>
public abstract class RunKeyMigrationContract : IAsyncLifetime
{
    private static readonly DateTimeOffset T0 = new(2026, 3, 1, 8, 0, 0, TimeSpan.Zero);

    private readonly IStoreDatabaseFactory _factory;

    private protected RunKeyMigrationContract(IStoreDatabaseFactory factory) => _factory = factory;

    private IStoreDatabase Database { get; set; } = null!;

    public async Task InitializeAsync()
    {
        Database = await _factory.CreateAsync();
        await using var connection = await Database.OpenAsync(CancellationToken.None);
        await connection.ExecuteAsync("CREATE TABLE schema_migrations (version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at_ms BIGINT NOT NULL)");
        foreach (var script in MigrationRunner.LoadScripts(Database.Dialect).Where(s => s.Version <= 8))
        {
            await connection.ExecuteAsync(script.Sql);
            await connection.ExecuteAsync("INSERT INTO schema_migrations (version, name, applied_at_ms) VALUES (@Version, @Name, 0)", new { script.Version, script.Name });
        }
    }

    public async Task DisposeAsync() => await _factory.DisposeAsync();

    [Fact]
    public async Task Migrate_OldStore_KeepsRunsAcceptsInterruptedAndStoresAKeyOnce()
    {
        var old = new HistoryStore(Database);
        var kept = await old.RecordRunAsync(HistoryStoreContract.Run("orders", T0, findings: [new(Core.Findings.FindingKind.SlopeShift, Core.Findings.Severity.Warning, 0.001, 1.2, "slope moved")]), CancellationToken.None);
        await using (var connection = await Database.OpenAsync(CancellationToken.None))
        {
            await Assert.ThrowsAnyAsync<Exception>(() => connection.ExecuteAsync(
                "INSERT INTO runs (pair, started_at_ms, finished_at_ms, status) VALUES ('orders', 1, 2, 'interrupted')"));
        }

        var applied = await new MigrationRunner(Database).MigrateAsync(CancellationToken.None);

        Assert.Equal(["009_run_keys", "010_several_workers", "011_webhook_outbox", "012_window_end", "013_slot_claims", "014_column_hints"], applied);
        var store = new HistoryStore(Database);
        var before = (await store.GetRunAsync(kept, includePoints: true, CancellationToken.None))!;
        Assert.Equal(("slope moved", 250), (Assert.Single(before.Findings).Message, before.Points!.UsedCount));

        var cut = new NewRun("orders", T0.AddHours(1), T0.AddHours(1), RunStatus.Interrupted, "cut off", null, [], null, null) { RunKey = "k1" };
        var first = await store.RecordRunAsync(cut, CancellationToken.None);
        var again = await store.RecordRunAsync(cut with { Error = "written again" }, CancellationToken.None);
        Assert.True(first > kept);
        Assert.Equal(first, again);
        var stored = (await store.GetRunAsync(first, includePoints: false, CancellationToken.None))!;
        Assert.Equal((RunStatus.Interrupted, "cut off"), (stored.Status, stored.Error));

        await using var check = await Database.OpenAsync(CancellationToken.None);
        await Assert.ThrowsAnyAsync<Exception>(() => check.ExecuteAsync(
            "INSERT INTO runs (pair, started_at_ms, finished_at_ms, status, run_key) VALUES ('orders', 1, 2, 'failed', 'k1')"));
        // Runs without a key (one-shot commands, older rows) are many.
        await check.ExecuteAsync("INSERT INTO runs (pair, started_at_ms, finished_at_ms, status) VALUES ('orders', 1, 2, 'failed')");
        Assert.Equal(2, await check.ExecuteScalarAsync<int>("SELECT COUNT(*) FROM runs WHERE run_key IS NULL"));
        await check.ExecuteAsync("DELETE FROM runs WHERE id = @kept", new { kept });
        Assert.Equal(0, await check.ExecuteScalarAsync<int>("SELECT COUNT(*) FROM findings"));
    }
}

public sealed class SqliteRunKeyMigrationTests() : RunKeyMigrationContract(new SqliteStoreDatabaseFactory());

[Collection(UsesPostgres.Name)]
public sealed class PostgresRunKeyMigrationTests(PostgresServer server) : RunKeyMigrationContract(new PostgresStoreDatabaseFactory(server));
