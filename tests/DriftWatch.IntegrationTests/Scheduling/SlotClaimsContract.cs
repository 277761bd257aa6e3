using DriftWatch.Core.Configuration;
using DriftWatch.Hosting;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.IntegrationTests.Store;
using DriftWatch.Monitoring;
using DriftWatch.Scheduling;
using DriftWatch.Store;
using Microsoft.Extensions.Logging.Abstractions;
using Microsoft.Extensions.Time.Testing;

namespace DriftWatch.IntegrationTests.Scheduling;

/// <summary>
/// Slot claims in the store (migration 013): a claim on (pair, slot) is taken once, by one of several workers
/// racing for it; a pair's job claims the pairs of its table group due in the same slot, and their own jobs then
/// find nothing left to check.
/// </summary>
public abstract class SlotClaimsContract : IAsyncLifetime
{
    private static readonly DateTimeOffset Slot = new(2026, 3, 2, 10, 0, 0, TimeSpan.Zero);

    private readonly IStoreDatabaseFactory _factory;

    private protected SlotClaimsContract(IStoreDatabaseFactory factory) => _factory = factory;

    private IStoreDatabase Database { get; set; } = null!;

    public async Task InitializeAsync()
    {
        Database = await _factory.CreateAsync();
        await new MigrationRunner(Database).MigrateAsync(CancellationToken.None);
    }

    public async Task DisposeAsync() => await _factory.DisposeAsync();

    [Fact]
    public async Task TryClaim_SamePairAndSlot_OnlyTheFirstOfManyWorkersWins()
    {
        var time = new FakeTimeProvider(Slot);
        var workers = Enumerable.Range(0, 6).Select(i => new SlotClaimStore(Database, $"worker-{i}", time)).ToList();

        var won = await Task.WhenAll(workers.Select(w => w.TryClaimAsync("orders", Slot, CancellationToken.None)));

        Assert.Single(won, w => w);
        Assert.True(await workers[0].TryClaimAsync("orders", Slot.AddHours(1), CancellationToken.None));
        Assert.True(await workers[1].TryClaimAsync("refunds", Slot, CancellationToken.None));
        Assert.False(await workers[2].TryClaimAsync("refunds", Slot, CancellationToken.None));
    }

    [Fact]
    public async Task TryClaim_OldClaims_ArePrunedAfterTwoDays()
    {
        var time = new FakeTimeProvider(Slot);
        Assert.True(await new SlotClaimStore(Database, "w", time).TryClaimAsync("orders", Slot, CancellationToken.None));

        // A fresh worker prunes at its first claim; three days on, the old row is gone.
        time.Advance(TimeSpan.FromDays(3));
        Assert.True(await new SlotClaimStore(Database, "w2", time).TryClaimAsync("refunds", time.GetUtcNow(), CancellationToken.None));

        Assert.True(await new SlotClaimStore(Database, "w3", time).TryClaimAsync("orders", Slot, CancellationToken.None));
    }

    [Fact]
    public async Task Claim_GroupDueInTheSameSlot_IsClaimedByTheFirstJobOnly()
    {
        PairConfig Pair(string name, string schedule = "0 0 * * * ?", string? where = null) => new()
        {
            Name = name, Source = "wh", Table = "meters", X = "a", Y = name, Schedule = schedule, Where = where,
        };
        var config = new DriftWatchConfig
        {
            Sources = [new SourceConfig { Name = "wh", Kind = SourceKind.Postgres, ConnectionString = "Host=unused" }],
            Pairs = [Pair("p1"), Pair("p2"), Pair("p3", schedule: "0 30 * * * ?"), Pair("p4", where: "a > 0"), Pair("p5", schedule: "0 0 */2 * * ?")],
        };
        var time = new FakeTimeProvider(Slot);
        var groups = new TableGroups(null!, null!, config, time, NullLogger<TableGroups>.Instance);
        SlotGroups Worker(string name) =>
            new(new LiveConfig(config, "h", Slot), groups, new SlotClaimStore(Database, name, time), NullLogger<SlotGroups>.Instance);
        var one = Worker("one");
        var two = Worker("two");

        // 10:00: p1, p2 and p5 (every other hour) fire; p3 fires at half past; p4 has its own filter.
        var first = await one.ClaimAsync(config.Pairs[1], Slot, CancellationToken.None);
        Assert.Equal(["p2", "p1", "p5"], first.Select(p => p.Name));
        Assert.Empty(await two.ClaimAsync(config.Pairs[0], Slot, CancellationToken.None));
        Assert.Empty(await one.ClaimAsync(config.Pairs[4], Slot, CancellationToken.None));
        Assert.Equal(["p4"], (await two.ClaimAsync(config.Pairs[3], Slot, CancellationToken.None)).Select(p => p.Name));
        // Started by hand (no slot): the pair alone, whatever was claimed.
        Assert.Equal(["p1"], (await one.ClaimAsync(config.Pairs[0], null, CancellationToken.None)).Select(p => p.Name));
        // 11:00: p5 does not fire, p1 and p2 share again.
        Assert.Equal(["p1", "p2"], (await two.ClaimAsync(config.Pairs[0], Slot.AddHours(1), CancellationToken.None)).Select(p => p.Name));
    }
}

public sealed class SqliteSlotClaimsTests() : SlotClaimsContract(new SqliteStoreDatabaseFactory());

[Collection(UsesPostgres.Name)]
public sealed class PostgresSlotClaimsTests(PostgresServer server) : SlotClaimsContract(new PostgresStoreDatabaseFactory(server));
