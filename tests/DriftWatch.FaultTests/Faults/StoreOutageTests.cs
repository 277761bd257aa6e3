using System.Text.Json;
using DriftWatch.FaultTests.Infrastructure;
using DriftWatch.IntegrationTests.Infrastructure;

namespace DriftWatch.FaultTests.Faults;

/// <summary>The store database stops taking connections for several check slots, then comes back, under a running worker.</summary>
[Collection(UsesPostgres.Name)]
public sealed class StoreOutageTests(PostgresServer server)
{
    private const string Pair = "km-vs-litres";
    private const int SpooledAtLeast = 3;

    [Fact]
    public async Task StoreStopped_RunsSpooled_WrittenOnceInOrderAfterRecovery_AlertsEvaluated_EachMailOnce_Serving()
    {
        await using var bench = await FaultBench.CreateAsync(server);
        // The baseline is the first run, so a change to the data after it gives runs with findings to keep.
        bench.WriteConfig(new WorkerSetup
        {
            Pairs = [new PairSpec(Pair, FaultBench.SourceTable)],
            CheckFailingAfter = 2,
            ExtraYaml = "defaults:\n  baseline: {first_runs: 1}\n",
        });
        using var worker = await bench.StartWorkerAsync();
        await Eventually.TrueAsync("a succeeded run", async _ => (await bench.RunsAsync(Pair)).Any(r => r.Status == "succeeded"), worker.OutputLog);
        // A unit change (litres to a unit 2.2 times smaller), the kind of shift the checks are for.
        await bench.Source.ExecuteAsync($"UPDATE {FaultBench.SourceTable} SET litres = litres * 2.2");
        await Eventually.TrueAsync("a run with findings", async _ => (await bench.StoredRunsAsync(Pair)).Any(r => r.Findings > 0), worker.OutputLog);
        var before = await bench.StoredRunsAsync(Pair);

        await bench.StopDatabaseAsync(bench.Store);
        // Several one-second slots pass with the store down; each finished check must land in the spool.
        var spooled = new Dictionary<string, SpooledRun>(StringComparer.Ordinal);
        var deepest = 0;
        await Eventually.TrueAsync($"{SpooledAtLeast} runs waiting in the spool (files and /healthz)", async ct =>
        {
            foreach (var run in bench.SpooledRuns())
            {
                spooled.TryAdd(run.RunKey, run);
            }

            if (await bench.HealthReportAsync(ct) is { } report && report.TryGetProperty("spool", out var spool))
            {
                deepest = Math.Max(deepest, spool.GetProperty("runs").GetInt32());
            }

            return spooled.Count >= SpooledAtLeast && deepest >= SpooledAtLeast;
        }, worker.OutputLog);
        var whileDown = await bench.HealthReportAsync();
        Assert.NotNull(whileDown);
        // The worker answers, and says what is wrong: the store, not itself.
        Assert.Equal("unhealthy", whileDown.Value.GetProperty("status").GetString());
        Assert.False(whileDown.Value.GetProperty("store").GetProperty("reachable").GetBoolean());
        Assert.True(whileDown.Value.GetProperty("scheduler").GetProperty("running").GetBoolean());
        Assert.False(whileDown.Value.GetProperty("spool").GetProperty("full").GetBoolean());

        await bench.StartDatabaseAsync(bench.Store);
        await Eventually.TrueAsync("the spool emptied into the store and /healthz ok", async ct =>
            await bench.HealthReportAsync(ct) is { } report
            && report.GetProperty("status").GetString() == "ok"
            && report.GetProperty("spool").GetProperty("runs").GetInt32() == 0, worker.OutputLog);
        // The failed runs of the outage count toward check_failing once written: confirmed, then cleared by the
        // next succeeded run, one mail each.
        await Eventually.TrueAsync("the check-failing alert of the outage cleared", async _ =>
            (await bench.CheckFailingAlertsAsync(Pair)) is [.., { Status: "cleared" }], worker.OutputLog);
        await bench.WaitAllSentAsync(2, worker.OutputLog);
        Assert.True(await bench.HealthyAsync(), "/healthz after the store came back");

        await worker.TerminateAsync();
        Assert.Equal(0, await worker.WaitForExitAsync(Eventually.Deadline));
        await bench.AssertEveryMailOnceAsync();
        var alert = Assert.Single(await bench.CheckFailingAlertsAsync(Pair));
        Assert.True(alert.Confirmed, "the outage's failed runs confirmed the check-failing alert");

        var after = await bench.StoredRunsAsync(Pair);
        var context = string.Join('\n', after) + "\n" + worker.OutputLog();
        // Exactly once: the unique index on run_key would refuse a second copy, so this checks the keys were kept.
        Assert.All(after, r => Assert.NotNull(r.RunKey));
        Assert.Equal(after.Count, after.Select(r => r.RunKey).Distinct(StringComparer.Ordinal).Count());
        var byKey = after.ToDictionary(r => r.RunKey!, StringComparer.Ordinal);
        foreach (var run in spooled.Values)
        {
            Assert.True(byKey.TryGetValue(run.RunKey, out var stored), $"spooled run {run.RunKey} missing from the store\n{context}");
            Assert.Equal(run.Findings, stored.Findings);
        }

        // Every check the worker made is a run in the store: one log line per check outcome, one run per line.
        var checks = worker.Output.Count(l => l.Contains($"Checked {Pair} in", StringComparison.Ordinal) || l.Contains($"Check of {Pair} ", StringComparison.Ordinal));
        Assert.True(checks == after.Count, $"{checks} checks logged, {after.Count} runs stored\n{context}");
        // In order: the store's order (id) is the order the checks started, spooled runs included.
        Assert.True(after.Zip(after.Skip(1)).All(p => p.First.StartedAtMs <= p.Second.StartedAtMs), "runs out of order\n" + context);
        // The runs of before the outage keep their findings, and checks after it find the shift again.
        Assert.All(before, r => Assert.Equal(r.Findings, byKey[r.RunKey!].Findings));
        Assert.Contains(after, r => r.Id > before[^1].Id && !spooled.ContainsKey(r.RunKey!) && r.Findings > 0);
    }
}
