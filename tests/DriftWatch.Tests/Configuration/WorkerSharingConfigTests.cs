namespace DriftWatch.Tests.Configuration;

/// <summary>
/// worker.shared_schedule, heartbeat and takeover_after: read with their defaults, refused with a message naming file,
/// line and column where they cannot work (lines counted by hand, 1-based).
/// </summary>
public sealed class WorkerSharingConfigTests
{
    // Lines 1-10; the test's own sections start on line 11.
    private const string OnePair = """
        sources:
          - name: shop
            kind: sqlite
            connection: shop.db
        pairs:
          - name: a
            source: shop
            table: t
            x: u
            y: v

        """;

    [Fact]
    public void Parse_NoWorkerKeys_DefaultsToOwnScheduleFiveSecondBeatsTwentySecondTakeover()
    {
        var result = ConfigText.Parse(OnePair);
        Assert.Empty(result.Errors);
        var worker = result.Config!.Worker;
        Assert.Equal((false, TimeSpan.FromSeconds(5), TimeSpan.FromSeconds(20)), (worker.SharedSchedule, worker.Heartbeat, worker.TakeoverAfter));
    }

    [Fact]
    public void Parse_SharedScheduleOnPostgres_ReadsAllThreeKeys()
    {
        var result = ConfigText.Parse(OnePair + "store:\n  kind: postgres\n  connection: Host=db;Database=dw\nworker:\n  shared_schedule: true\n  heartbeat: 2s\n  takeover_after: 9s\n");
        Assert.Empty(result.Errors);
        var worker = result.Config!.Worker;
        Assert.Equal((true, TimeSpan.FromSeconds(2), TimeSpan.FromSeconds(9)), (worker.SharedSchedule, worker.Heartbeat, worker.TakeoverAfter));
    }

    [Fact]
    public void Parse_SharedScheduleOnSqlite_IsRefusedNamingTheStore()
    {
        var errors = ConfigText.Lines(ConfigText.Parse(OnePair + "worker:\n  shared_schedule: true\n"));
        Assert.Equal(["test.yaml:12:20: worker.shared_schedule: needs a PostgreSQL store (store.kind: postgres): the shared schedule lives in the store's database"], errors);
    }

    [Fact]
    public void Parse_TakeoverShorterThanTwoHeartbeats_IsRefused()
    {
        var errors = ConfigText.Lines(ConfigText.Parse(OnePair + "worker:\n  heartbeat: 5s\n  takeover_after: 8s\n"));
        Assert.Equal(["test.yaml:13:19: worker.takeover_after: must be at least 2 heartbeats (10s), was 8s"], errors);
    }
}
