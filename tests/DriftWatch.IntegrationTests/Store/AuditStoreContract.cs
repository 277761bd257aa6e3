using Dapper;
using DriftWatch.Core.Triage;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Store;
using DriftWatch.Triage;

namespace DriftWatch.IntegrationTests.Store;

/// <summary>The audit log and the baseline resets of migration 008 on each real database engine.</summary>
public abstract class AuditStoreContract : IAsyncLifetime
{
    private static readonly DateTimeOffset T0 = new(2026, 10, 5, 9, 30, 0, TimeSpan.Zero);
    private readonly IStoreDatabaseFactory _factory;
    private IStoreDatabase _database = null!;

    private protected AuditStoreContract(IStoreDatabaseFactory factory) => _factory = factory;

    public async Task InitializeAsync()
    {
        _database = await _factory.CreateAsync();
        await new MigrationRunner(_database).MigrateAsync(CancellationToken.None);
    }

    public async Task DisposeAsync() => await _factory.DisposeAsync();

    [Fact]
    public async Task Append_ThenList_RoundTripsEveryField_NewestFirst_PerPair()
    {
        var store = new AuditStore(_database);
        var ack = new AuditEntry(0, T0.AddMilliseconds(123), "Dana Whitfield", Actor.ViaDashboard, AuditAction.Ack, "invoices.gross_vs_net", 42, null, "known change", "became_perfect (critical, confirmed)");
        var snooze = new AuditEntry(0, T0.AddMinutes(5), "ops", Actor.ViaCli, AuditAction.Snooze, "invoices.gross_vs_net", null, null, "backfill", "until 2026-10-06 09:35 UTC");
        var accept = new AuditEntry(0, T0.AddMinutes(9), "ops", Actor.ViaCli, AuditAction.BaselineAccept, "orders.total_vs_items", null, 7_000_000_001, null, "run 7000000001 …");
        var ids = new List<long>();
        foreach (var entry in new[] { ack, snooze, accept })
        {
            ids.Add(await store.AppendAsync(entry, CancellationToken.None));
        }

        Assert.Equal(ids.Order(), ids);
        var all = await store.ListAsync(null, 10, CancellationToken.None);
        Assert.Equal([accept with { Id = ids[2] }, snooze with { Id = ids[1] }, ack with { Id = ids[0] }], all);

        var one = await store.ListAsync("invoices.gross_vs_net", 10, CancellationToken.None);
        Assert.Equal([AuditAction.Snooze, AuditAction.Ack], one.Select(e => e.Action));
        Assert.Equal([AuditAction.BaselineAccept], (await store.ListAsync(null, 1, CancellationToken.None)).Select(e => e.Action));
        Assert.Empty(await store.ListAsync("no.such_pair", 10, CancellationToken.None));

        // Stored as the migration's snake_case words, which the table's CHECK accepts.
        await using var connection = await _database.OpenAsync(CancellationToken.None);
        Assert.Equal(["ack", "snooze", "baseline_accept"], await connection.QueryAsync<string>("SELECT action FROM audit_log ORDER BY id"));
    }

    [Fact]
    public async Task Append_ALongReason_KeepsItsFirst500Characters()
    {
        var store = new AuditStore(_database);
        var reason = string.Concat(Enumerable.Repeat("0123456789", 60));
        await store.AppendAsync(new AuditEntry(0, T0, "ops", Actor.ViaCli, AuditAction.BaselineReset, "p", null, null, reason, null), CancellationToken.None);

        Assert.Equal(reason[..AuditStore.MaxReasonLength], (await store.ListAsync(null, 1, CancellationToken.None))[0].Reason);
    }

    [Fact]
    public async Task BaselineResets_SetMoveAndClear_PerPair()
    {
        var resets = new BaselineResetStore(_database);
        Assert.Null(await resets.GetResetAsync("a", CancellationToken.None));

        await resets.SetResetAsync("a", T0, CancellationToken.None);
        await resets.SetResetAsync("b", T0.AddHours(1), CancellationToken.None);
        await resets.SetResetAsync("a", T0.AddHours(2), CancellationToken.None);
        Assert.Equal(T0.AddHours(2), await resets.GetResetAsync("a", CancellationToken.None));
        Assert.Equal(T0.AddHours(1), await resets.GetResetAsync("b", CancellationToken.None));

        await resets.ClearResetAsync("a", CancellationToken.None);
        Assert.Null(await resets.GetResetAsync("a", CancellationToken.None));
        Assert.Equal(T0.AddHours(1), await resets.GetResetAsync("b", CancellationToken.None));
    }
}

public sealed class SqliteAuditStoreTests() : AuditStoreContract(new SqliteStoreDatabaseFactory());

[Collection(UsesPostgres.Name)]
public sealed class PostgresAuditStoreTests(PostgresServer server) : AuditStoreContract(new PostgresStoreDatabaseFactory(server));
