using System.Text.Json;
using DriftWatch.FaultTests.Infrastructure;
using DriftWatch.IntegrationTests.Infrastructure;

namespace DriftWatch.FaultTests.Faults;

/// <summary>
/// Three <c>driftwatch run</c> processes sharing one schedule in one PostgreSQL store (worker.shared_schedule), one of
/// them killed with SIGKILL in the middle of a check and started again. What must hold: every slot of every pair
/// checked exactly once over the whole span (the killed check's slot run again by another worker, nothing twice, no
/// slot skipped), every run evaluated for alerts exactly once (an alert's streak equals the runs that carried its
/// finding), and no mail sent twice (the real SMTP server's count of each Message-Id).
/// </summary>
[Collection(UsesPostgres.Name)]
public sealed class SharedScheduleTests(PostgresServer server)
{
    private const long TwoSeconds = 2000;
    private const long ThreeSeconds = 3000;

    [Fact]
    public async Task ThreeWorkers_OneKilledMidCheckAndRestarted_EverySlotOnce_EveryRunEvaluatedOnce_NoMailTwice()
    {
        await using var bench = await FaultBench.CreateAsync(server);
        // A check of "slow" reads the view twice (figures, sample), sleeping 0.7 s each time: about half of its 3 s
        // period is in flight, to be killed.
        await bench.SetPauseAsync(0.7);
        bench.WriteConfig(new WorkerSetup
        {
            Shared = true,
            CheckFailingAfter = 2,
            Pairs =
            [
                new PairSpec("fuel", FaultBench.SourceTable, "0/2 * * * * ?"),
                // litres rise with km in the bench's table: declared negative, every run carries a critical sign_flip.
                new PairSpec("contrary", FaultBench.SourceTable, "0/2 * * * * ?", Declared: "{direction: negative}"),
                new PairSpec("broken", "no_such_table", "0/2 * * * * ?"),
                new PairSpec("slow", FaultBench.SlowView, "0/3 * * * * ?"),
            ],
        });
        var ports = new Dictionary<string, int> { ["w1"] = FreePort.Next(), ["w2"] = FreePort.Next(), ["w3"] = FreePort.Next() };
        var workers = new Dictionary<string, WorkerProcess>(StringComparer.Ordinal);
        foreach (var (id, port) in ports)
        {
            workers[id] = await bench.StartSharedWorkerAsync(id, port);
        }

        string Logs() => string.Join("\n", workers.Select(w => $"=== {w.Key}\n{w.Value.OutputLog()}"));

        // Both alerts confirmed and mailed (one digest may carry both), and every worker's heartbeat in the store.
        await Eventually.TrueAsync("the first mail sent", async _ => (await bench.OutboxAsync()) is { Count: >= 1 } outbox && outbox.All(m => m.Sent), Logs);
        await Eventually.TrueAsync("three live workers in /healthz", async _ =>
        {
            using var health = JsonDocument.Parse(await FaultBench.HealthBodyAsync(ports["w1"]));
            var workersJson = health.RootElement.GetProperty("workers");
            return workersJson.GetProperty("alive").GetInt32() == 3;
        }, Logs);
        using (var health = JsonDocument.Parse(await FaultBench.HealthBodyAsync(ports["w2"])))
        {
            var workersJson = health.RootElement.GetProperty("workers");
            Assert.False(workersJson.GetProperty("config_mismatch").GetBoolean());
            var instances = workersJson.GetProperty("instances").EnumerateArray().ToList();
            Assert.Equal(["w1", "w2", "w3"], instances.Select(i => i.GetProperty("id").GetString()!.Split(':')[0]).Order(StringComparer.Ordinal));
            Assert.All(instances, i => Assert.True(i.GetProperty("shared_schedule").GetBoolean()));
            Assert.Contains(instances, i => i.GetProperty("last_pair").ValueKind == JsonValueKind.String);
        }

        // The dashboard's overview shows the same workers.
        Assert.Contains("Workers (3 alive)", await FaultBench.PageAsync(ports["w3"], "/"), StringComparison.Ordinal);

        // Some history before the kill, so "slots before the kill" below does not depend on how soon after start the
        // kill lands: four recorded slots of every pair put the first one at least three periods back.
        foreach (var pair in new[] { "fuel", "contrary", "broken", "slow" })
        {
            await Eventually.TrueAsync($"four slots of {pair} before the kill", async _ =>
                (await bench.SlotRunsAsync(pair)).Count(r => r.SlotAtMs is not null) >= 4, Logs);
        }

        // SIGKILL the worker running a check of "slow" while its query has just started sleeping.
        string? victim = null;
        await Eventually.TrueAsync("a check of slow just started", async _ =>
        {
            if (await bench.FreshSleepingQueriesAsync() == 0 || await bench.ExecutingInstanceAsync("slow") is not { } instance)
            {
                return false;
            }

            victim = instance.Split(':')[0];
            await workers[victim].KillHardAsync();
            return true;
        }, Logs);
        var killedAt = DateTimeOffset.UtcNow.ToUnixTimeMilliseconds();
        workers[victim!] = await bench.StartSharedWorkerAsync(victim!, ports[victim!]);

        // Well past the takeover (5 s) and the catch-up of the slots missed meanwhile: ten more slots of every pair.
        foreach (var pair in new[] { "fuel", "contrary", "broken", "slow" })
        {
            await Eventually.TrueAsync($"ten slots of {pair} after the kill", async _ =>
                (await bench.SlotRunsAsync(pair)).Count(r => r.SlotAtMs > killedAt) >= 10, Logs);
        }

        // Alert evaluation has read every run of "contrary" recorded so far, and every mail is out.
        await Eventually.TrueAsync("alert evaluation caught up with contrary", async _ =>
        {
            var runs = await bench.SlotRunsAsync("contrary");
            return (await bench.AlertsOfKindAsync("contrary", "sign_flip")) is [{ LastRunId: { } last }] && last == runs[^1].Id;
        }, Logs);
        await bench.WaitAllSentAsync(1, Logs);

        await Task.WhenAll(workers.Values.Select(w => w.TerminateAsync()));
        foreach (var (id, worker) in workers)
        {
            Assert.Equal(0, await worker.WaitForExitAsync(Eventually.Deadline));
        }

        // Every slot exactly once: per pair, the slots of its completed runs are distinct and follow the cron period
        // without a hole from the first to the last. Runs cut off by the kill are recorded as interrupted, without a slot.
        foreach (var (pair, period) in new[] { ("fuel", TwoSeconds), ("contrary", TwoSeconds), ("broken", TwoSeconds), ("slow", ThreeSeconds) })
        {
            var runs = await bench.SlotRunsAsync(pair);
            var slots = runs.Where(r => r.Status != "interrupted").Select(r => r.SlotAtMs).ToList();
            Assert.All(slots, s => Assert.NotNull(s));
            var ordered = slots.Select(s => s!.Value).Order().ToList();
            var duplicates = ordered.GroupBy(s => s).Where(g => g.Count() > 1).Select(g => g.Key).ToList();
            Assert.True(duplicates.Count == 0, $"{pair}: slots checked twice: {string.Join(", ", duplicates)}\n{Logs()}");
            var holes = ordered.Zip(ordered.Skip(1)).Where(p => p.Second - p.First != period).ToList();
            Assert.True(holes.Count == 0, $"{pair}: slots missing between {string.Join(", ", holes)}\n{Logs()}");
            Assert.Contains(ordered, s => s < killedAt - (2 * period));
            Assert.True(ordered.Count(s => s > killedAt) >= 10, $"{pair}: fewer than ten slots after the kill");
        }

        // The killed check of "slow": its start marker became an interrupted run when its worker came back.
        Assert.Single(await bench.SlotRunsAsync("slow"), r => r.Status == "interrupted");

        // Every run evaluated once: the sign_flip streak counts each evaluated run that carried the finding once.
        var alert = Assert.Single(await bench.AlertsOfKindAsync("contrary", "sign_flip"));
        Assert.Equal("confirmed", alert.Status);
        var carried = await bench.RunsWithFindingAsync("contrary", "sign_flip", alert.LastRunId!.Value);
        Assert.True(carried >= 10, $"only {carried} runs of contrary carried sign_flip");
        Assert.Equal(carried, alert.ConsecutiveRuns);
        Assert.Equal("confirmed", Assert.Single(await bench.CheckFailingAlertsAsync("broken")).Status);

        // No mail twice, none lost: each message the outbox sent was received exactly once.
        await bench.AssertEveryMailOnceAsync();
    }
}
