using Dapper;
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
    private protected static readonly DateTimeOffset Slot = new(2026, 3, 2, 10, 0, 0, TimeSpan.Zero);

    private readonly IStoreDatabaseFactory _factory;

    private protected SlotClaimsContract(IStoreDatabaseFactory factory) => _factory = factory;

    private protected IStoreDatabase Database { get; private set; } = null!;

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
        var config = GroupedConfig();
        var one = Worker(config, "one");
        var two = Worker(config, "two");

        // 10:00: p1, p2 and p5 (every other hour) fire; p3 fires at half past; p4 has its own filter.
        var first = await one.ClaimAsync(config.Pairs[1], Slot, recovering: false, CancellationToken.None);
        Assert.Equal(["p2", "p1", "p5"], first.Select(p => p.Name));
        Assert.Empty(await two.ClaimAsync(config.Pairs[0], Slot, recovering: false, CancellationToken.None));
        Assert.Empty(await one.ClaimAsync(config.Pairs[4], Slot, recovering: false, CancellationToken.None));
        Assert.Equal(["p4"], (await two.ClaimAsync(config.Pairs[3], Slot, recovering: false, CancellationToken.None)).Select(p => p.Name));
        // Started by hand (no slot): the pair alone, whatever was claimed.
        Assert.Equal(["p1"], (await one.ClaimAsync(config.Pairs[0], null, recovering: false, CancellationToken.None)).Select(p => p.Name));
        // 11:00: p5 does not fire, p1 and p2 share again.
        Assert.Equal(["p1", "p2"], (await two.ClaimAsync(config.Pairs[0], Slot.AddHours(1), recovering: false, CancellationToken.None)).Select(p => p.Name));
    }

    /// <summary>p1 and p2 read the same table every hour, p3 at half past, p4 has its own filter, p5 fires every other hour.</summary>
    private protected static DriftWatchConfig GroupedConfig()
    {
        PairConfig Pair(string name, string schedule = "0 0 * * * ?", string? where = null) => new()
        {
            Name = name, Source = "wh", Table = "meters", X = "a", Y = name, Schedule = schedule, Where = where,
        };
        return new DriftWatchConfig
        {
            Sources = [new SourceConfig { Name = "wh", Kind = SourceKind.Postgres, ConnectionString = "Host=unused" }],
            Pairs = [Pair("p1"), Pair("p2"), Pair("p3", schedule: "0 30 * * * ?"), Pair("p4", where: "a > 0"), Pair("p5", schedule: "0 0 */2 * * ?")],
        };
    }

    /// <summary>A worker's slot groups; <paramref name="owner"/> is its process as the claims name it.</summary>
    private protected SlotGroups Worker(DriftWatchConfig config, string owner)
    {
        var time = new FakeTimeProvider(Slot);
        var groups = new TableGroups(null!, null!, config, time, NullLogger<TableGroups>.Instance);
        return new SlotGroups(new LiveConfig(config, "h", Slot), groups, new SlotClaimStore(Database, owner, time), NullLogger<SlotGroups>.Instance);
    }
}

public sealed class SqliteSlotClaimsTests() : SlotClaimsContract(new SqliteStoreDatabaseFactory());

[Collection(UsesPostgres.Name)]
public sealed class PostgresSlotClaimsTests(PostgresServer server) : SlotClaimsContract(new PostgresStoreDatabaseFactory(server))
{
    /// <summary>
    /// A worker claims p1's slot with its group (p1, p2, p5) and dies; Quartz takes it off qrtz_scheduler_state and
    /// runs its job for p1 again on a live worker. That recovered job must check the whole group: the jobs of p2 and
    /// p5 found their claims taken and returned, so without a takeover they would miss the slot. Claims of a worker
    /// still in the shared schedule stay its own.
    /// </summary>
    [Fact]
    public async Task Recovered_JobOfADeadWorker_TakesOverItsWholeGroup_ButNeverALiveWorkersClaims()
    {
        var config = GroupedConfig();
        await AddMemberAsync("rescuer:2:1");
        await AddMemberAsync("alive:3:1");
        var dead = Worker(config, "dead:1:1");
        var rescuer = Worker(config, "rescuer:2:1");
        var late = Worker(config, "late:4:1");
        var alive = Worker(config, "alive:3:1");
        Assert.Equal(["p1", "p2", "p5"], (await dead.ClaimAsync(config.Pairs[0], Slot, recovering: false, CancellationToken.None)).Select(p => p.Name));

        // Not recovering: the claim is taken, whoever holds it.
        Assert.Empty(await rescuer.ClaimAsync(config.Pairs[0], Slot, recovering: false, CancellationToken.None));
        // Recovering: the dead worker's claims on p1 and the rest of its group pass to the rescuer.
        Assert.Equal(["p1", "p2", "p5"], (await rescuer.ClaimAsync(config.Pairs[0], Slot, recovering: true, CancellationToken.None)).Select(p => p.Name));
        Assert.Equal(["rescuer:2:1"], await HoldersAsync(Slot));
        // A second recovered job for p2 (its job had also been on the dead worker) finds the rescuer alive: nothing left.
        Assert.Empty(await late.ClaimAsync(config.Pairs[1], Slot, recovering: true, CancellationToken.None));

        // A live worker's claim is never taken over, even by a recovered job.
        var next = Slot.AddHours(1);
        Assert.Equal(["p1", "p2"], (await alive.ClaimAsync(config.Pairs[0], next, recovering: false, CancellationToken.None)).Select(p => p.Name));
        Assert.Empty(await late.ClaimAsync(config.Pairs[1], next, recovering: true, CancellationToken.None));
        Assert.Equal(["alive:3:1"], await HoldersAsync(next));

        // A recovered job whose worker died before claiming anything claims as usual.
        Assert.Equal(["p4"], (await late.ClaimAsync(config.Pairs[3], Slot, recovering: true, CancellationToken.None)).Select(p => p.Name));
    }

    private async Task AddMemberAsync(string instance)
    {
        await using var connection = await Database.OpenAsync(CancellationToken.None);
        await connection.ExecuteAsync(
            "INSERT INTO qrtz_scheduler_state (sched_name, instance_name, last_checkin_time, checkin_interval) VALUES (@s, @i, 0, 5000)",
            new { s = SharedSchedule.SchedulerName, i = instance });
    }

    private async Task<IReadOnlyList<string>> HoldersAsync(DateTimeOffset slot)
    {
        await using var connection = await Database.OpenAsync(CancellationToken.None);
        return [.. await connection.QueryAsync<string>(
            "SELECT DISTINCT claimed_by FROM slot_claims WHERE slot_ms = @slot AND pair IN ('p1', 'p2', 'p5')", new { slot = slot.ToUnixTimeMilliseconds() })];
    }
}
