using Dapper;
using DriftWatch.Core.History;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Store;

/// <summary>
/// Migration 010 on a store last migrated by an older release (scripts up to 009): runs are kept and gain the slot
/// they were for; worker_instances and worker_leases work on both dialects (a lease has one holder until it runs
/// out; a heartbeat row is written, updated and listed); on PostgreSQL the Quartz job store's tables exist.
/// </summary>
public abstract class SeveralWorkersMigrationContract : IAsyncLifetime
{
    private static readonly DateTimeOffset T0 = new(2026, 3, 1, 8, 0, 0, TimeSpan.Zero);
    private static readonly TimeSpan Ttl = TimeSpan.FromSeconds(20);

    private readonly IStoreDatabaseFactory _factory;

    private protected SeveralWorkersMigrationContract(IStoreDatabaseFactory factory) => _factory = factory;

    private IStoreDatabase Database { get; set; } = null!;

    public async Task InitializeAsync()
    {
        Database = await _factory.CreateAsync();
        await using var connection = await Database.OpenAsync(CancellationToken.None);
        await connection.ExecuteAsync("CREATE TABLE schema_migrations (version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at_ms BIGINT NOT NULL)");
        foreach (var script in MigrationRunner.LoadScripts(Database.Dialect).Where(s => s.Version <= 9))
        {
            await connection.ExecuteAsync(script.Sql);
            await connection.ExecuteAsync("INSERT INTO schema_migrations (version, name, applied_at_ms) VALUES (@Version, @Name, 0)", new { script.Version, script.Name });
        }
    }

    public async Task DisposeAsync() => await _factory.DisposeAsync();

    [Fact]
    public async Task Migrate_OldStore_KeepsRuns_RecordsSlots_LeasesHaveOneHolder_InstancesBeat()
    {
        var kept = await new HistoryStore(Database).RecordRunAsync(HistoryStoreContract.Run("orders", T0), CancellationToken.None);

        var applied = await new MigrationRunner(Database).MigrateAsync(CancellationToken.None);

        Assert.Equal(["010_several_workers", "011_webhook_outbox", "012_window_end", "013_slot_claims", "014_column_hints"], applied);
        var store = new HistoryStore(Database);
        Assert.NotNull(await store.GetRunAsync(kept, includePoints: false, CancellationToken.None));
        var slot = T0.AddMinutes(5);
        var slotted = await store.RecordRunAsync(HistoryStoreContract.Run("orders", T0.AddMinutes(5).AddMilliseconds(40)) with { SlotAt = slot }, CancellationToken.None);
        await using (var connection = await Database.OpenAsync(CancellationToken.None))
        {
            var slots = (await connection.QueryAsync<(long Id, long? Slot)>("SELECT id, slot_at_ms FROM runs ORDER BY id")).ToList();
            Assert.Equal([(kept, null), (slotted, slot.ToUnixTimeMilliseconds())], slots);
        }

        // One holder at a time; the holder renews; another takes the lease only once it has run out.
        var leases = new WorkerLeases(Database);
        Assert.True(await leases.TryAcquireAsync("alert-evaluation", "a", T0, Ttl, CancellationToken.None));
        Assert.False(await leases.TryAcquireAsync("alert-evaluation", "b", T0.AddSeconds(19), Ttl, CancellationToken.None));
        Assert.True(await leases.RenewAsync("alert-evaluation", "a", T0.AddSeconds(10), Ttl, CancellationToken.None));
        Assert.False(await leases.TryAcquireAsync("alert-evaluation", "b", T0.AddSeconds(29), Ttl, CancellationToken.None));
        Assert.True(await leases.TryAcquireAsync("alert-evaluation", "b", T0.AddSeconds(30), Ttl, CancellationToken.None));
        Assert.False(await leases.RenewAsync("alert-evaluation", "a", T0.AddSeconds(31), Ttl, CancellationToken.None));
        Assert.Equal("b", await leases.HolderAsync("alert-evaluation", T0.AddSeconds(31), CancellationToken.None));
        await leases.ReleaseAsync("alert-evaluation", "a", CancellationToken.None);
        Assert.Equal("b", await leases.HolderAsync("alert-evaluation", T0.AddSeconds(31), CancellationToken.None));
        await leases.ReleaseAsync("alert-evaluation", "b", CancellationToken.None);
        Assert.Null(await leases.HolderAsync("alert-evaluation", T0.AddSeconds(31), CancellationToken.None));
        Assert.True(await leases.TryAcquireAsync("store-maintenance", "a", T0, Ttl, CancellationToken.None));

        // Heartbeats: written, updated in place, listed most recent first; a clean stop removes the row.
        var instances = new WorkerInstances(Database);
        var a = new WorkerInstance("w1:10:1", "host-a", 10, T0, T0, "aa", true, null, null);
        var b = new WorkerInstance("w2:20:2", "host-b", 20, T0, T0.AddSeconds(1), "bb", true, "orders", T0);
        await instances.BeatAsync(a, CancellationToken.None);
        await instances.BeatAsync(b, CancellationToken.None);
        await instances.BeatAsync(a with { LastSeenAt = T0.AddSeconds(5), LastPair = "orders", LastCheckAt = T0.AddSeconds(4) }, CancellationToken.None);
        var listed = await instances.ListAsync(CancellationToken.None);
        Assert.Equal([a with { LastSeenAt = T0.AddSeconds(5), LastPair = "orders", LastCheckAt = T0.AddSeconds(4) }, b], listed);
        await instances.RemoveAsync(a.Id, CancellationToken.None);
        Assert.Equal([b], await instances.ListAsync(CancellationToken.None));

        if (Database.Dialect == StoreDialect.Postgres)
        {
            await using var connection = await Database.OpenAsync(CancellationToken.None);
            var tables = (await connection.QueryAsync<string>("SELECT table_name FROM information_schema.tables WHERE table_name LIKE 'qrtz%' ORDER BY 1")).ToList();
            Assert.Contains("qrtz_triggers", tables);
            Assert.Contains("qrtz_scheduler_state", tables);
            Assert.Contains("qrtz_fired_triggers", tables);
        }
    }
}

public sealed class SqliteSeveralWorkersMigrationTests() : SeveralWorkersMigrationContract(new SqliteStoreDatabaseFactory());

[Collection(UsesPostgres.Name)]
public sealed class PostgresSeveralWorkersMigrationTests(PostgresServer server) : SeveralWorkersMigrationContract(new PostgresStoreDatabaseFactory(server));
