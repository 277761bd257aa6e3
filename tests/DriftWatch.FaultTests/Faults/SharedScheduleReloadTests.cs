using System.Text.Json;
using DriftWatch.FaultTests.Infrastructure;
using DriftWatch.IntegrationTests.Infrastructure;

namespace DriftWatch.FaultTests.Faults;

/// <summary>
/// Live reload with the schedule in the store: two workers share one file; a pair added to the file is stored once
/// and checked once per slot, a pair removed is no longer checked, and both workers end on the same configuration.
/// </summary>
[Collection(UsesPostgres.Name)]
public sealed class SharedScheduleReloadTests(PostgresServer server)
{
    [Fact]
    public async Task TwoWorkers_FileGainsAndLosesAPair_StoredJobsFollow_EachSlotOnce()
    {
        await using var bench = await FaultBench.CreateAsync(server);
        var fuel = new PairSpec("fuel", FaultBench.SourceTable, "0/2 * * * * ?");
        var extra = new PairSpec("extra", FaultBench.SourceTable, "1/2 * * * * ?");
        bench.WriteConfig(new WorkerSetup { Shared = true, Pairs = [fuel] });
        var ports = new[] { FreePort.Next(), FreePort.Next() };
        using var one = await bench.StartSharedWorkerAsync("r1", ports[0]);
        using var two = await bench.StartSharedWorkerAsync("r2", ports[1]);
        string Logs() => one.OutputLog() + "\n" + two.OutputLog();

        await Eventually.TrueAsync("three slots of fuel", async _ => (await bench.SlotRunsAsync("fuel")).Count >= 3, Logs);
        bench.WriteConfig(new WorkerSetup { Shared = true, Pairs = [fuel, extra] });
        await Eventually.TrueAsync("five slots of extra", async _ => (await bench.SlotRunsAsync("extra")).Count >= 5, Logs);
        await Eventually.TrueAsync("both workers on the new file", async _ =>
            one.Output.Any(l => l.Contains("(2 pairs)", StringComparison.Ordinal)) && two.Output.Any(l => l.Contains("(2 pairs)", StringComparison.Ordinal))
            && await SameConfigurationAsync(ports[0]), Logs);

        bench.WriteConfig(new WorkerSetup { Shared = true, Pairs = [extra] });
        await Eventually.TrueAsync("both workers on the file without fuel", async _ =>
            one.Output.Any(l => l.Contains("(1 pairs)", StringComparison.Ordinal))
            && two.Output.Any(l => l.Contains("(1 pairs)", StringComparison.Ordinal)), Logs);
        var fuelRunsAtRemoval = (await bench.SlotRunsAsync("fuel")).Count;
        var extraBefore = (await bench.SlotRunsAsync("extra")).Count;
        await Eventually.TrueAsync("five more slots of extra", async _ => (await bench.SlotRunsAsync("extra")).Count >= extraBefore + 5, Logs);

        await Task.WhenAll(one.TerminateAsync(), two.TerminateAsync());
        Assert.Equal(0, await one.WaitForExitAsync(Eventually.Deadline));
        Assert.Equal(0, await two.WaitForExitAsync(Eventually.Deadline));

        // fuel: at most a check already running when it was removed is recorded after the removal.
        Assert.InRange((await bench.SlotRunsAsync("fuel")).Count, fuelRunsAtRemoval, fuelRunsAtRemoval + 1);
        foreach (var pair in new[] { "fuel", "extra" })
        {
            var slots = (await bench.SlotRunsAsync(pair)).Select(r => r.SlotAtMs!.Value).Order().ToList();
            Assert.True(slots.Distinct().Count() == slots.Count, $"{pair}: a slot checked twice: {string.Join(", ", slots)}\n{Logs()}");
            var holes = slots.Zip(slots.Skip(1)).Where(p => p.Second - p.First != 2000).ToList();
            Assert.True(holes.Count == 0, $"{pair}: slots missing between {string.Join(", ", holes)}\n{Logs()}");
        }
    }

    private static async Task<bool> SameConfigurationAsync(int port)
    {
        using var health = JsonDocument.Parse(await FaultBench.HealthBodyAsync(port));
        var workers = health.RootElement.GetProperty("workers");
        return workers.GetProperty("alive").GetInt32() == 2 && !workers.GetProperty("config_mismatch").GetBoolean();
    }
}
