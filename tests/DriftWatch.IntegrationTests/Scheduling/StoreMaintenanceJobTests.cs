using Dapper;
using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.IntegrationTests.Alerting;
using DriftWatch.IntegrationTests.Store;
using DriftWatch.Scheduling;
using DriftWatch.Store;
using Microsoft.Extensions.Logging.Abstractions;
using Microsoft.Extensions.Time.Testing;

namespace DriftWatch.IntegrationTests.Scheduling;

/// <summary>
/// The maintenance job is the one place retention happens: runs, cleared alerts, ended snoozes and sent messages
/// past their retention go in one pass, on a real SQLite store; open alerts, active snoozes and unsent messages stay.
/// </summary>
public sealed class StoreMaintenanceJobTests : IDisposable
{
    private static readonly DateTimeOffset Now = new(2026, 9, 1, 12, 0, 0, TimeSpan.Zero);

    private readonly TemporarySqliteStore _file = new();

    [Fact]
    public async Task Execute_PrunesEveryTablePastItsRetention_KeepsWhatIsOpenUnsentOrRecent()
    {
        var database = await _file.OpenAsync();
        var config = new DriftWatchConfig();
        var options = new OutboxOptions();
        var history = new HistoryStore(database, config.Store.PointsPerRun);
        var alerts = new AlertStore(database);
        var outbox = new OutboxStore(database);

        await history.RecordRunAsync(HistoryStoreContract.Run("p", Now - config.Store.Retention - TimeSpan.FromDays(1)), CancellationToken.None);
        await history.RecordRunAsync(HistoryStoreContract.Run("p", Now - TimeSpan.FromDays(1)), CancellationToken.None);
        var oldClear = Now - options.ClearedRetention - TimeSpan.FromDays(1);
        await alerts.ApplyCycleAsync(
            new CycleDecision(Now, [Cleared("old", oldClear), Cleared("recent", Now - TimeSpan.FromDays(10)), Open("open", Now - TimeSpan.FromDays(300))], []),
            [Message("dw-old@driftwatch.local"), Message("dw-new@driftwatch.local"), Message("dw-unsent@driftwatch.local")],
            null,
            CancellationToken.None);
        var claimed = await outbox.ClaimDueAsync(Now, TimeSpan.FromMinutes(5), "worker-a", 10, CancellationToken.None);
        await outbox.MarkSentAsync(claimed.Single(e => e.MessageId == "dw-old@driftwatch.local").Id, Now - options.SentRetention - TimeSpan.FromDays(1), CancellationToken.None);
        await outbox.MarkSentAsync(claimed.Single(e => e.MessageId == "dw-new@driftwatch.local").Id, Now - TimeSpan.FromDays(1), CancellationToken.None);
        await alerts.SnoozeAsync("ended-long-ago", oldClear, oldClear - TimeSpan.FromDays(1), null, CancellationToken.None);
        await alerts.SnoozeAsync("ended-yesterday", Now - TimeSpan.FromDays(1), Now - TimeSpan.FromDays(2), null, CancellationToken.None);
        await alerts.SnoozeAsync("active", Now + TimeSpan.FromDays(1), Now, null, CancellationToken.None);

        var job = new StoreMaintenanceJob(config, history, alerts, outbox, options, new FakeTimeProvider(Now), NullLogger<StoreMaintenanceJob>.Instance);
        // The job reads nothing from Quartz's context.
        await job.Execute(null!, CancellationToken.None);

        Assert.Equal([Now - TimeSpan.FromDays(1)], (await history.GetRunsAsync("p", 10, includePoints: false, CancellationToken.None)).Select(r => r.StartedAt));
        Assert.Equal(["open", "recent"], (await alerts.ListAlertsAsync(DateTimeOffset.UnixEpoch, 10, CancellationToken.None)).Select(a => a.Pair).Order(StringComparer.Ordinal));
        Assert.Equal(["dw-new@driftwatch.local", "dw-unsent@driftwatch.local"], (await outbox.ListOutboxAsync(false, 10, CancellationToken.None)).Select(e => e.MessageId).Order(StringComparer.Ordinal));
        await using var connection = await database.OpenAsync(CancellationToken.None);
        Assert.Equal(["active", "ended-yesterday"], await connection.QueryAsync<string>("SELECT pair FROM snoozes ORDER BY pair"));
    }

    public void Dispose() => _file.Dispose();

    private static AlertState Cleared(string pair, DateTimeOffset at) =>
        new(0, pair, FindingKind.SignFlip, Severity.Critical, AlertStatus.Cleared, 1, at, at, null, null, at, null, pair, null);

    private static AlertState Open(string pair, DateTimeOffset since) =>
        new(0, pair, FindingKind.SignFlip, Severity.Critical, AlertStatus.Confirmed, 3, since, Now, since, since, null, null, pair, null);

    private static OutboxMessage Message(string id) =>
        new(id, "team", ChannelKind.Smtp, Now - TimeSpan.FromDays(60), "DriftWatch · test", ["a@example.org"], [1, 2, 3]);
}
