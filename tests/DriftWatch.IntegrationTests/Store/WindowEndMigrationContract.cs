using Dapper;
using DriftWatch.Core.History;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Store;

/// <summary>
/// Migration 012 on a store migrated by an older release (every script before 012): runs are kept and read with
/// no window end and as made at their own time; new runs keep where their window ended and, back-dated ones
/// (<c>check --as-of</c>), when they were made; the alert feed never hands a back-dated run to alerting.
/// </summary>
public abstract class WindowEndMigrationContract : IAsyncLifetime
{
    private static readonly DateTimeOffset T0 = new(2026, 3, 1, 8, 0, 0, TimeSpan.Zero);

    private readonly IStoreDatabaseFactory _factory;

    private protected WindowEndMigrationContract(IStoreDatabaseFactory factory) => _factory = factory;

    private IStoreDatabase Database { get; set; } = null!;

    public async Task InitializeAsync()
    {
        Database = await _factory.CreateAsync();
        await using var connection = await Database.OpenAsync(CancellationToken.None);
        await connection.ExecuteAsync("CREATE TABLE schema_migrations (version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at_ms BIGINT NOT NULL)");
        foreach (var script in MigrationRunner.LoadScripts(Database.Dialect).Where(s => s.Version < 12))
        {
            await connection.ExecuteAsync(script.Sql);
            await connection.ExecuteAsync("INSERT INTO schema_migrations (version, name, applied_at_ms) VALUES (@Version, @Name, 0)", new { script.Version, script.Name });
        }
    }

    public async Task DisposeAsync() => await _factory.DisposeAsync();

    [Fact]
    public async Task Migrate_OldStore_KeepsRuns_ThenStoresWindowEndAndBackDating_AndTheFeedSkipsBackDatedRuns()
    {
        var old = new HistoryStore(Database);
        var kept = await old.RecordRunAsync(HistoryStoreContract.Run("orders", T0), CancellationToken.None);

        var applied = await new MigrationRunner(Database).MigrateAsync(CancellationToken.None);

        Assert.Equal(["012_window_end", "013_slot_claims", "014_column_hints"], applied);
        var store = new HistoryStore(Database);
        var before = (await store.GetRunAsync(kept, includePoints: true, CancellationToken.None))!;
        Assert.Equal((250, (DateTimeOffset?)null, (DateTimeOffset?)null), (before.Points!.UsedCount, before.WindowEnd, before.BackDatedAt));

        var loadAt = new DateTimeOffset(2026, 3, 1, 6, 0, 0, 123, TimeSpan.Zero);
        var live = await store.RecordRunAsync(HistoryStoreContract.Run("orders", T0.AddHours(1)) with { WindowEnd = loadAt }, CancellationToken.None);
        var madeAt = T0.AddDays(5);
        var backDated = await store.RecordRunAsync(
            HistoryStoreContract.Run("orders", T0.AddMinutes(30)) with { WindowEnd = loadAt.AddDays(-1), BackDatedAt = madeAt }, CancellationToken.None);
        var after = await store.RecordRunAsync(HistoryStoreContract.Run("orders", T0.AddHours(2)), CancellationToken.None);

        var liveRun = (await store.GetRunAsync(live, includePoints: false, CancellationToken.None))!;
        var backDatedRun = (await store.GetRunAsync(backDated, includePoints: false, CancellationToken.None))!;
        Assert.Equal((loadAt, (DateTimeOffset?)null), (liveRun.WindowEnd!.Value, liveRun.BackDatedAt));
        Assert.Equal((loadAt.AddDays(-1), madeAt), (backDatedRun.WindowEnd!.Value, backDatedRun.BackDatedAt!.Value));
        // History orders runs by the time they are about: the back-dated one sits between the first two.
        var newestFirst = await store.GetRunsAsync("orders", 10, includePoints: false, CancellationToken.None);
        Assert.Equal([after, live, backDated, kept], newestFirst.Select(r => r.Id));

        var fed = await new RunFeed(Database).GetRunsAfterAsync(kept, 10, CancellationToken.None);
        Assert.Equal([live, after], fed.Select(r => r.Id));
    }
}

public sealed class SqliteWindowEndMigrationTests() : WindowEndMigrationContract(new SqliteStoreDatabaseFactory());

[Collection(UsesPostgres.Name)]
public sealed class PostgresWindowEndMigrationTests(PostgresServer server) : WindowEndMigrationContract(new PostgresStoreDatabaseFactory(server));
