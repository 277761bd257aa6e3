using Dapper;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Store;
using static DriftWatch.IntegrationTests.Alerting.AlertHarness;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>What every alert store must do, run against each real database engine (subclasses pick one).</summary>
public abstract class AlertStoreContract
{
    private static readonly DateTimeOffset T0 = Start;

    /// <summary>A freshly migrated, empty store. Calling it twice in one test gives two handles on the same database.</summary>
    private protected abstract Task<IStoreDatabase> DatabaseAsync();

    [Fact]
    public async Task Migrate_AppliesHistoryAndAlertScripts()
    {
        var database = await DatabaseAsync();
        await using var connection = await database.OpenAsync(CancellationToken.None);

        var versions = await connection.QueryAsync<int>("SELECT version FROM schema_migrations ORDER BY version");

        // 001 history, 002 alerts, 003 worker state, 004 unmeasurable runs, 005 baseline runs, 006 alert
        // vocabulary, 007 outbox claims, 008 audit log and baseline resets, 009 run keys, 010 several workers, 011 webhook
        // outbox, 012 window end and back-dated runs, 013 slot claims, 014 column hints: all of them, in order.
        Assert.Equal([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14], versions);
    }

    [Fact]
    public async Task ApplyCycle_NewAndChangedStates_RoundTripWithIds()
    {
        var store = new AlertStore(await DatabaseAsync());
        var watching = State("orders", FindingKind.SlopeShift, Severity.Warning, AlertStatus.Watching);
        var confirmed = State("orders", FindingKind.BecamePerfect, Severity.Critical, AlertStatus.Confirmed) with { ConfirmedAt = T0, LastNotifiedAt = T0 };
        var other = State("invoices", FindingKind.NullSurge, Severity.Warning, AlertStatus.Watching);

        var saved = await store.ApplyCycleAsync(new CycleDecision(T0, [watching, confirmed, other], []), [], null, CancellationToken.None);
        var later = saved[0] with { Status = AlertStatus.Confirmed, ConsecutiveRuns = 2, LastSeen = T0.AddHours(1), ConfirmedAt = T0.AddHours(1), Message = "slope doubled" };
        await store.ApplyCycleAsync(new CycleDecision(T0.AddHours(1), [later], []), [], null, CancellationToken.None);

        Assert.All(saved, s => Assert.True(s.Id > 0));
        Assert.Equal(3, saved.Select(s => s.Id).Distinct().Count());
        var open = await store.GetOpenAlertsAsync(["orders"], CancellationToken.None);
        Assert.Equal([later, saved[1]], open.OrderBy(a => a.Id));
        Assert.Equal(3, (await store.GetOpenAlertsAsync(null, CancellationToken.None)).Count);
    }

    [Fact]
    public async Task ApplyCycle_OutboxInsertFails_StoresNoAlertChangeEither()
    {
        var database = await DatabaseAsync();
        var store = new AlertStore(database);
        var outbox = new OutboxStore(database);
        var alert = State("orders", FindingKind.BecamePerfect, Severity.Critical, AlertStatus.Confirmed) with { LastNotifiedAt = T0 };
        // A NULL subject violates the outbox's NOT NULL constraint inside the transaction.
        var broken = new OutboxMessage("dw-broken@driftwatch.local", "team", ChannelKind.Smtp, T0, null!, [], [1, 2, 3]);

        await Assert.ThrowsAnyAsync<Exception>(() => store.ApplyCycleAsync(new CycleDecision(T0, [alert], [new AlertNotification(alert, NotificationKind.Confirmed)]), [broken], null, CancellationToken.None));

        Assert.Empty(await store.GetOpenAlertsAsync(null, CancellationToken.None));
        Assert.Empty(await outbox.ListOutboxAsync(false, 10, CancellationToken.None));
    }

    [Fact]
    public async Task ApplyCycle_SecondOpenAlertForTheSamePairAndKind_IsRefused()
    {
        var store = new AlertStore(await DatabaseAsync());
        var alert = State("orders", FindingKind.SignFlip, Severity.Critical, AlertStatus.Confirmed);
        await store.ApplyCycleAsync(new CycleDecision(T0, [alert], []), [], null, CancellationToken.None);

        await Assert.ThrowsAnyAsync<Exception>(() => store.ApplyCycleAsync(new CycleDecision(T0, [alert with { FirstSeen = T0.AddHours(1) }], []), [], null, CancellationToken.None));

        Assert.Single(await store.GetOpenAlertsAsync(null, CancellationToken.None));
    }

    [Fact]
    public async Task ApplyCycle_MessageIdAlreadyQueued_IsNotQueuedTwice()
    {
        var database = await DatabaseAsync();
        var store = new AlertStore(database);
        var outbox = new OutboxStore(database);
        var message = Message("dw-once@driftwatch.local");

        await store.ApplyCycleAsync(CycleDecision.Empty(T0), [message], null, CancellationToken.None);
        await store.ApplyCycleAsync(CycleDecision.Empty(T0), [message], null, CancellationToken.None);

        var entry = Assert.Single(await outbox.ListOutboxAsync(false, 10, CancellationToken.None));
        Assert.Equal(message.MessageId, entry.MessageId);
        Assert.Equal(["a@example.org", "b@example.org"], entry.Recipients);
        Assert.Equal(ChannelKind.Smtp, entry.Channel);
        Assert.Null(entry.Mime);
    }

    [Fact]
    public async Task Ack_OpenAlert_IsKeptAcrossLaterCycles_AndClearedAlertsCannotBeAcked()
    {
        var store = new AlertStore(await DatabaseAsync());
        var saved = (await store.ApplyCycleAsync(new CycleDecision(T0, [State("orders", FindingKind.SignFlip, Severity.Critical, AlertStatus.Confirmed)], []), [], null, CancellationToken.None))[0];

        Assert.True(await store.AckAsync(saved.Id, T0.AddMinutes(5), CancellationToken.None));
        // The lifecycle loaded the state before the ack: its write must not erase the ack.
        var update = await store.ApplyCycleAsync(new CycleDecision(T0.AddHours(1), [saved with { ConsecutiveRuns = 2 }], []), [], null, CancellationToken.None);
        var cleared = await store.ApplyCycleAsync(new CycleDecision(T0.AddHours(2), [update[0] with { Status = AlertStatus.Cleared, ClearedAt = T0.AddHours(2) }], []), [], null, CancellationToken.None);

        Assert.Equal(T0.AddMinutes(5), update[0].AckedAt);
        Assert.Equal(T0.AddMinutes(5), (await store.GetAlertAsync(saved.Id, CancellationToken.None))!.AckedAt);
        Assert.False(await store.AckAsync(cleared[0].Id, T0.AddHours(3), CancellationToken.None));
        Assert.False(await store.AckAsync(999_999, T0, CancellationToken.None));
    }

    [Fact]
    public async Task Snooze_IsActiveUntilItsEnd_ReplacedBySnoozingAgain_AndLiftedByUnsnooze()
    {
        var store = new AlertStore(await DatabaseAsync());

        await store.SnoozeAsync("orders", T0.AddHours(2), T0, "planned migration", CancellationToken.None);
        await store.SnoozeAsync("invoices", T0.AddHours(1), T0, null, CancellationToken.None);
        await store.SnoozeAsync("invoices", T0.AddHours(3), T0, "longer", CancellationToken.None);

        var atStart = await store.GetActiveSnoozesAsync(T0, CancellationToken.None);
        Assert.Equal(T0.AddHours(2), atStart["orders"]);
        Assert.Equal(T0.AddHours(3), atStart["invoices"]);
        Assert.Equal(["invoices"], (await store.GetActiveSnoozesAsync(T0.AddHours(2), CancellationToken.None)).Keys);
        Assert.Equal("longer", (await store.ListSnoozesAsync(T0, CancellationToken.None)).Single(s => s.Pair == "invoices").Reason);
        Assert.True(await store.UnsnoozeAsync("invoices", CancellationToken.None));
        Assert.Empty(await store.GetActiveSnoozesAsync(T0.AddHours(2), CancellationToken.None));
    }

    [Fact]
    public async Task ClaimDue_LeasesEntries_SoASecondClaimGetsNothingUntilTheLeaseEnds()
    {
        var database = await DatabaseAsync();
        var store = new AlertStore(database);
        var outbox = new OutboxStore(database);
        var other = new OutboxStore(database);
        await store.ApplyCycleAsync(CycleDecision.Empty(T0), [Message("dw-1@driftwatch.local"), Message("dw-2@driftwatch.local")], null, CancellationToken.None);

        var first = await outbox.ClaimDueAsync(T0, TimeSpan.FromMinutes(5), "worker-a", 10, CancellationToken.None);
        var during = await other.ClaimDueAsync(T0.AddMinutes(4), TimeSpan.FromMinutes(5), "worker-b", 10, CancellationToken.None);
        await outbox.MarkSentAsync(first[0].Id, T0.AddMinutes(1), CancellationToken.None);
        var after = await other.ClaimDueAsync(T0.AddMinutes(5), TimeSpan.FromMinutes(5), "worker-b", 10, CancellationToken.None);

        Assert.Equal(["dw-1@driftwatch.local", "dw-2@driftwatch.local"], first.Select(e => e.MessageId));
        Assert.Equal([1, 2, 3], first[0].Mime);
        Assert.Empty(during);
        Assert.Equal("dw-2@driftwatch.local", Assert.Single(after).MessageId);
    }

    [Fact]
    public async Task ClaimDue_SeveralDispatchersAtOnce_NeverShareAnEntry()
    {
        var database = await DatabaseAsync();
        var store = new AlertStore(database);
        await store.ApplyCycleAsync(CycleDecision.Empty(T0), [.. Enumerable.Range(0, 40).Select(i => Message($"dw-{i}@driftwatch.local"))], null, CancellationToken.None);

        // Four dispatchers (own store objects, own connections) claim in parallel until nothing is left.
        var claimers = Enumerable.Range(0, 4).Select(async _ =>
        {
            var mine = new List<string>();
            var own = new OutboxStore(await ReopenAsync());
            while (await own.ClaimDueAsync(T0, TimeSpan.FromMinutes(5), "worker-a", 3, CancellationToken.None) is { Count: > 0 } batch)
            {
                mine.AddRange(batch.Select(e => e.MessageId));
            }

            return mine;
        });
        var claimed = (await Task.WhenAll(claimers)).SelectMany(c => c).ToArray();

        Assert.Equal(40, claimed.Length);
        Assert.Equal(40, claimed.Distinct(StringComparer.Ordinal).Count());
    }

    [Fact]
    public async Task MarkFailed_RecordsTheErrorAndTheNextAttempt()
    {
        var database = await DatabaseAsync();
        var store = new AlertStore(database);
        var outbox = new OutboxStore(database);
        await store.ApplyCycleAsync(CycleDecision.Empty(T0), [Message("dw-f@driftwatch.local")], null, CancellationToken.None);
        var entry = Assert.Single(await outbox.ClaimDueAsync(T0, TimeSpan.FromMinutes(5), "worker-a", 10, CancellationToken.None));

        await outbox.MarkFailedAsync(entry.Id, "connection refused", T0.AddMinutes(2), CancellationToken.None);

        var stored = Assert.Single(await outbox.ListOutboxAsync(true, 10, CancellationToken.None));
        Assert.Equal((1, "connection refused", T0.AddMinutes(2)), (stored.Attempts, stored.LastError, stored.NextAttemptAt));
        Assert.Empty(await outbox.ClaimDueAsync(T0.AddMinutes(1), TimeSpan.FromMinutes(5), "worker-a", 10, CancellationToken.None));
        Assert.Single(await outbox.ClaimDueAsync(T0.AddMinutes(2), TimeSpan.FromMinutes(5), "worker-a", 10, CancellationToken.None));
    }

    [Fact]
    public async Task TakeBackClaims_OwnClaimsAreDueAtOnce_OtherOwnersAndFailedOnesKeepTheirTime()
    {
        var database = await DatabaseAsync();
        var store = new AlertStore(database);
        var outbox = new OutboxStore(database);
        await store.ApplyCycleAsync(CycleDecision.Empty(T0), [Message("dw-a@driftwatch.local"), Message("dw-b@driftwatch.local"), Message("dw-f@driftwatch.local")], null, CancellationToken.None);
        var a = await outbox.ClaimDueAsync(T0, TimeSpan.FromMinutes(1), "worker-a", 1, CancellationToken.None);
        var b = await outbox.ClaimDueAsync(T0, TimeSpan.FromMinutes(1), "worker-b", 1, CancellationToken.None);
        var f = await outbox.ClaimDueAsync(T0, TimeSpan.FromMinutes(1), "worker-a", 1, CancellationToken.None);
        await outbox.MarkFailedAsync(f[0].Id, "connection refused", T0.AddMinutes(10), CancellationToken.None);

        var taken = await outbox.TakeBackClaimsAsync("worker-a", T0.AddSeconds(5), CancellationToken.None);
        var due = await outbox.ClaimDueAsync(T0.AddSeconds(5), TimeSpan.FromMinutes(1), "worker-c", 10, CancellationToken.None);

        // Only worker-a's message still in hand: worker-b may be sending its own, the failed one waits for its retry.
        Assert.Equal(1, taken);
        Assert.Equal([a[0].MessageId], due.Select(e => e.MessageId));
        Assert.Equal("dw-b@driftwatch.local", b[0].MessageId);
    }

    [Fact]
    public async Task RenewClaims_ExtendsLeasesStillHeld_NeverARetryAlreadyScheduled()
    {
        var database = await DatabaseAsync();
        var store = new AlertStore(database);
        var outbox = new OutboxStore(database);
        await store.ApplyCycleAsync(CycleDecision.Empty(T0), [Message("dw-1@driftwatch.local"), Message("dw-2@driftwatch.local")], null, CancellationToken.None);
        var claimed = await outbox.ClaimDueAsync(T0, TimeSpan.FromMinutes(1), "worker-a", 10, CancellationToken.None);
        await outbox.MarkFailedAsync(claimed[1].Id, "connection refused", T0.AddMinutes(10), CancellationToken.None);

        var renewed = await outbox.RenewClaimsAsync([claimed[0].Id, claimed[1].Id], "worker-a", T0.AddSeconds(80), CancellationToken.None);
        var byOther = await outbox.RenewClaimsAsync([claimed[0].Id], "worker-b", T0.AddMinutes(30), CancellationToken.None);

        Assert.Equal((1, 0), (renewed, byOther));
        var stored = (await outbox.ListOutboxAsync(true, 10, CancellationToken.None)).ToDictionary(e => e.MessageId, e => e.NextAttemptAt);
        Assert.Equal(T0.AddSeconds(80), stored["dw-1@driftwatch.local"]);
        Assert.Equal(T0.AddMinutes(10), stored["dw-2@driftwatch.local"]);
    }

    [Fact]
    public async Task Prune_DropsOldSentMessagesAndOldClearedAlerts_KeepsTheRest()
    {
        var database = await DatabaseAsync();
        var store = new AlertStore(database);
        var outbox = new OutboxStore(database);
        var clearedOld = State("a", FindingKind.SignFlip, Severity.Critical, AlertStatus.Cleared) with { ClearedAt = T0 };
        var clearedNew = State("b", FindingKind.SignFlip, Severity.Critical, AlertStatus.Cleared) with { ClearedAt = T0.AddDays(10) };
        var open = State("c", FindingKind.SignFlip, Severity.Critical, AlertStatus.Confirmed);
        await store.ApplyCycleAsync(new CycleDecision(T0, [clearedOld, clearedNew, open], []), [Message("dw-old@driftwatch.local"), Message("dw-new@driftwatch.local"), Message("dw-unsent@driftwatch.local")], null, CancellationToken.None);
        var entries = await outbox.ClaimDueAsync(T0, TimeSpan.FromMinutes(5), "worker-a", 10, CancellationToken.None);
        await outbox.MarkSentAsync(entries.Single(e => e.MessageId == "dw-old@driftwatch.local").Id, T0, CancellationToken.None);
        await outbox.MarkSentAsync(entries.Single(e => e.MessageId == "dw-new@driftwatch.local").Id, T0.AddDays(10), CancellationToken.None);

        var prunedSent = await outbox.PruneSentAsync(T0.AddDays(5), CancellationToken.None);
        var prunedCleared = await store.PruneClearedAsync(T0.AddDays(5), CancellationToken.None);

        Assert.Equal((1, 1), (prunedSent, prunedCleared));
        Assert.Equal(["dw-new@driftwatch.local", "dw-unsent@driftwatch.local"], (await outbox.ListOutboxAsync(false, 10, CancellationToken.None)).Select(e => e.MessageId).Order(StringComparer.Ordinal));
        Assert.Equal(["b", "c"], (await store.ListAlertsAsync(T0.AddYears(-1), 10, CancellationToken.None)).Select(a => a.Pair).Order(StringComparer.Ordinal));
    }

    [Fact]
    public async Task ListAlerts_ShowsOpenFirstThenRecentlyCleared()
    {
        var store = new AlertStore(await DatabaseAsync());
        await store.ApplyCycleAsync(new CycleDecision(T0,
        [
            State("old", FindingKind.SignFlip, Severity.Critical, AlertStatus.Cleared) with { ClearedAt = T0.AddDays(-30) },
            State("recent", FindingKind.SignFlip, Severity.Critical, AlertStatus.Cleared) with { ClearedAt = T0.AddDays(-1), LastSeen = T0.AddHours(5) },
            State("open", FindingKind.SignFlip, Severity.Warning, AlertStatus.Watching),
        ], []), [], null, CancellationToken.None);

        var listed = await store.ListAlertsAsync(T0.AddDays(-7), 10, CancellationToken.None);
        var forPair = await store.ListAlertsAsync(T0.AddDays(-7), 10, CancellationToken.None, pair: "recent");

        Assert.Equal(["open", "recent"], listed.Select(a => a.Pair));
        Assert.Equal(["recent"], forPair.Select(a => a.Pair));
    }

    [Fact]
    public async Task Lifecycle_WarningConfirmRuns_SurvivesARestart()
    {
        var pair = Pair("orders");
        var finding = new Finding(FindingKind.SlopeShift, Severity.Warning, null, 0.4, "slope moved from 0.5 to 0.9");
        var config = new AlertingConfig { MailingLists = [new MailingListConfig { Name = "archive", Channel = ChannelKind.File, Directory = Path.GetTempPath() }] };

        var before = new AlertHarness(await DatabaseAsync(), config);
        var first = await before.CycleAsync((pair, [finding]));
        // A new store object, as after a restart of the worker, over the same database.
        var after = new AlertHarness(await ReopenAsync(), config);
        after.Time.Advance(TimeSpan.FromHours(1));
        var second = await after.CycleAsync((pair, [finding]));

        Assert.Empty(first.Queued);
        Assert.Equal(AlertStatus.Watching, Assert.Single(first.Saved).Status);
        var confirmed = Assert.Single(second.Saved);
        Assert.Equal((AlertStatus.Confirmed, 2, first.Saved[0].Id), (confirmed.Status, confirmed.ConsecutiveRuns, confirmed.Id));
        Assert.Single(second.Queued);
        Assert.Single(await after.Outbox.ListOutboxAsync(true, 10, CancellationToken.None));
    }

    /// <summary>A second handle on the database of this test's last <see cref="DatabaseAsync"/>, not a new database.</summary>
    private protected abstract Task<IStoreDatabase> ReopenAsync();

    private static AlertState State(string pair, FindingKind kind, Severity severity, AlertStatus status) =>
        new(0, pair, kind, severity, status, 1, T0, T0, status == AlertStatus.Confirmed ? T0 : null, null, null, null, $"{pair} {kind}", 42);

    private static OutboxMessage Message(string id) =>
        new(id, "team", ChannelKind.Smtp, T0, "DriftWatch · test", ["a@example.org", "b@example.org"], [1, 2, 3]);
}
