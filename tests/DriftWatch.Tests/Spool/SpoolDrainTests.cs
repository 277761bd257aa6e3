using DriftWatch.Core.History;
using DriftWatch.Spool;
using Microsoft.Extensions.Logging.Abstractions;
using Microsoft.Extensions.Time.Testing;

namespace DriftWatch.Tests.Spool;

public sealed class SpoolDrainTests : IDisposable
{
    private readonly SpoolFixture _fixture = new();

    [Fact]
    public async Task Drain_WritesInArrivalOrderAndEmptiesTheSpool()
    {
        var spool = _fixture.OpenSpool();
        spool.TryAppend(SpoolFixture.Run("orders", 2));
        spool.TryAppend(SpoolFixture.Run("orders", 1));
        using var drain = new SpoolDrain(spool, _fixture.Store, NullLogger<SpoolDrain>.Instance);

        Assert.Equal(2, await drain.DrainAsync(CancellationToken.None));

        // Store ids follow the spool's order (the run feed reads by id), not the start times.
        var runs = (await _fixture.Store.GetRunsAsync("orders", 10, includePoints: false, CancellationToken.None)).OrderBy(r => r.Id).ToList();
        Assert.Equal([SpoolFixture.T0.AddHours(2), SpoolFixture.T0.AddHours(1)], runs.Select(r => r.StartedAt));
        Assert.Equal(0, spool.Count);
    }

    [Fact]
    public async Task Drain_AfterACrashBetweenStoreWriteAndSpoolDelete_StoresTheRunOnce()
    {
        var spool = _fixture.OpenSpool();
        spool.TryAppend(SpoolFixture.Run("orders", 1));
        spool.TryAppend(SpoolFixture.Run("orders", 2));
        // The crash: the first run reached the store, its file was never deleted.
        var entry = spool.Peek()!;
        var firstId = await _fixture.Store.RecordRunAsync(entry.Run, CancellationToken.None);

        var restarted = _fixture.OpenSpool();
        using var drain = new SpoolDrain(restarted, _fixture.Store, NullLogger<SpoolDrain>.Instance);
        await drain.DrainAsync(CancellationToken.None);

        var runs = await _fixture.Store.GetRunsAsync("orders", 10, includePoints: false, CancellationToken.None);
        Assert.Equal(2, runs.Count);
        Assert.Equal(firstId, runs.Single(r => r.StartedAt == SpoolFixture.T0.AddHours(1)).Id);
        Assert.Equal(0, restarted.Count);
    }

    [Fact]
    public async Task Drain_StoreUnreachable_KeepsEveryRunInOrderForTheNextDrain()
    {
        var spool = _fixture.OpenSpool();
        spool.TryAppend(SpoolFixture.Run("orders", 1));
        spool.TryAppend(SpoolFixture.Run("orders", 2));
        // A store file in a folder that does not exist: every open fails, as a stopped server's would.
        var missing = new DriftWatch.Store.HistoryStore(new DriftWatch.Store.SqliteStoreDatabase($"Data Source={Path.Combine(_fixture.Folder, "no-such-folder", "store.db")};Mode=ReadWrite"));
        using var down = new SpoolDrain(spool, missing, NullLogger<SpoolDrain>.Instance);

        Assert.Equal(0, await down.DrainAsync(CancellationToken.None));
        Assert.Equal(2, spool.Count);

        using var up = new SpoolDrain(spool, _fixture.Store, NullLogger<SpoolDrain>.Instance);
        Assert.Equal(2, await up.DrainAsync(CancellationToken.None));
    }

    [Fact]
    public async Task Start_WithMarkersLeft_RecordsInterruptedRunsExceptForAChecksAlreadyStored()
    {
        var markers = new CheckMarkers(_fixture.Options, NullLogger<CheckMarkers>.Instance);
        var cutOff = new CheckMarker("k-cut", "orders", SpoolFixture.T0.AddHours(3));
        var storedThenCrashed = new CheckMarker("k-stored", "refunds", SpoolFixture.T0.AddHours(4));
        markers.Leave(cutOff);
        markers.Leave(storedThenCrashed);
        // The second check's run reached the store; the crash came before its marker was deleted.
        await _fixture.Store.RecordRunAsync(SpoolFixture.Run("refunds", 4, key: "k-stored"), CancellationToken.None);

        var spool = _fixture.OpenSpool();
        using var drain = new SpoolDrain(spool, _fixture.Store, NullLogger<SpoolDrain>.Instance);
        var time = new FakeTimeProvider(SpoolFixture.T0.AddHours(5));
        using var service = new SpoolService(spool, new CheckMarkers(_fixture.Options, NullLogger<CheckMarkers>.Instance), drain, time, NullLogger<SpoolService>.Instance);
        await service.StartAsync(CancellationToken.None);
        await service.StopAsync(CancellationToken.None);

        var interrupted = Assert.Single(await _fixture.Store.GetRunsAsync("orders", 10, includePoints: false, CancellationToken.None));
        Assert.Equal((RunStatus.Interrupted, SpoolFixture.T0.AddHours(3)), (interrupted.Status, interrupted.StartedAt));
        Assert.Contains("started at 2026-11-30 11:00:00Z", interrupted.Error, StringComparison.Ordinal);
        var refunds = Assert.Single(await _fixture.Store.GetRunsAsync("refunds", 10, includePoints: false, CancellationToken.None));
        Assert.Equal(RunStatus.Succeeded, refunds.Status);
        Assert.Empty(markers.Left());
    }

    public void Dispose() => _fixture.Dispose();
}
