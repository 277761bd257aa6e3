using System.Text.RegularExpressions;
using Dapper;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Store;

/// <summary>
/// Migration 006 on a store last migrated by an older release (scripts 001–005 only): stored alert states are
/// converted in place, times and outbox rows keep their values, the open-alert index and the id sequence hold.
/// The older states are read from the older release's own schema (the CHECK constraint of script 002, in its
/// order: seen, told, closed), and rows are written positionally as that release laid the tables out. Checked
/// through the current store and against the database's own constraint enforcement.
/// </summary>
public abstract partial class AlertVocabularyMigrationContract : IAsyncLifetime
{
    private static readonly DateTimeOffset T0 = new(2026, 3, 1, 8, 0, 0, TimeSpan.Zero);

    private readonly IStoreDatabaseFactory _factory;

    private protected AlertVocabularyMigrationContract(IStoreDatabaseFactory factory) => _factory = factory;

    private IStoreDatabase Database { get; set; } = null!;

    /// <summary>The alert states of script 002, in the order it lists them.</summary>
    private string[] OldStates { get; set; } = [];

    public async Task InitializeAsync()
    {
        Database = await _factory.CreateAsync();
        var scripts = MigrationRunner.LoadScripts(Database.Dialect);
        OldStates = [.. StatusCheck().Match(scripts.Single(s => s.Version == 2).Sql).Groups[1].Value.Split(',').Select(v => v.Trim().Trim('\''))];
        Assert.Equal(3, OldStates.Length);

        // An old store: the scripts before 006, applied and recorded as that release's runner did.
        await using var connection = await Database.OpenAsync(CancellationToken.None);
        await connection.ExecuteAsync("CREATE TABLE schema_migrations (version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at_ms BIGINT NOT NULL)");
        foreach (var script in scripts.Where(s => s.Version < 6))
        {
            await connection.ExecuteAsync(script.Sql);
            await connection.ExecuteAsync("INSERT INTO schema_migrations (version, name, applied_at_ms) VALUES (@Version, @Name, 0)", new { script.Version, script.Name });
        }
    }

    public async Task DisposeAsync() => await _factory.DisposeAsync();

    [Fact]
    public async Task Migrate_OldStore_ConvertsStatesKeepsTimesOutboxIndexAndIds()
    {
        var t0 = T0.ToUnixTimeMilliseconds();
        var hour = (long)TimeSpan.FromHours(1).TotalMilliseconds;
        await using (var connection = await Database.OpenAsync(CancellationToken.None))
        {
            // Positional: (id, pair, kind, severity, status, consecutive_runs, first_seen, last_seen, confirmation time,
            // last_notified, closing time, acked, message, last_run_id), as script 002 ordered the columns. The id is
            // the table's own (1, 2, 3, 4 in a fresh table): SQLite numbers a NULL id, PostgreSQL a DEFAULT one.
            var id = Database.Dialect == StoreDialect.Sqlite ? "NULL" : "DEFAULT";
            var insert = $"INSERT INTO alerts VALUES ({id}, @pair, @kind, @severity, @status, @runs, @first, @last, @confirmed, @notified, @closed, NULL, @message, 7)";
            await connection.ExecuteAsync(insert, new { pair = "orders", kind = "slope_shift", severity = "warning", status = OldStates[0], runs = 1, first = t0, last = t0, confirmed = (long?)null, notified = (long?)null, closed = (long?)null, message = "seen once" });
            await connection.ExecuteAsync(insert, new { pair = "orders", kind = "became_perfect", severity = "critical", status = OldStates[1], runs = 3, first = t0, last = t0 + 2 * hour, confirmed = (long?)t0, notified = (long?)t0, closed = (long?)null, message = "exact copy" });
            await connection.ExecuteAsync(insert, new { pair = "orders", kind = "became_perfect", severity = "critical", status = OldStates[2], runs = 2, first = t0 - 10 * hour, last = t0 - 9 * hour, confirmed = (long?)(t0 - 10 * hour), notified = (long?)(t0 - 10 * hour), closed = (long?)(t0 - 8 * hour), message = "was exact" });
            await connection.ExecuteAsync(insert, new { pair = "refunds", kind = "sign_flip", severity = "critical", status = OldStates[2], runs = 1, first = t0, last = t0, confirmed = (long?)null, notified = (long?)null, closed = (long?)t0, message = "pruned later" });
            await connection.ExecuteAsync("DELETE FROM alerts WHERE id = 4");
            // Positional: (id, message_id, mailing list, channel, created, next_attempt, attempts, last_error, sent, subject, recipients, mime).
            await connection.ExecuteAsync(
                $"INSERT INTO outbox VALUES ({(Database.Dialect == StoreDialect.Sqlite ? "NULL" : "DEFAULT")}, 'dw-old@driftwatch.local', 'data-team', 'smtp', @t0, @t0, 0, NULL, NULL, 'an old subject', '[\"data@example.org\"]', @mime)",
                new { t0, mime = new byte[] { 1, 2, 3 } });
        }

        var applied = await new MigrationRunner(Database).MigrateAsync(CancellationToken.None);

        // Every script after 005 runs, 007 (the owner of outbox claims) over the outbox rows this old store holds,
        // 008 (audit log, baseline resets) adding its empty tables, 009 the run keys, 010 several workers, 011 the webhook
        // outbox (the outbox row this old store holds is carried over), 012 the window end of runs, 013 the slot claims.
        Assert.Equal(["006_alert_vocabulary", "007_outbox_claims", "008_triage_audit", "009_run_keys", "010_several_workers", "011_webhook_outbox", "012_window_end", "013_slot_claims", "014_column_hints"], applied);
        var store = new AlertStore(Database);
        var open = await store.GetOpenAlertsAsync(null, CancellationToken.None);
        Assert.Equal([(1L, AlertStatus.Watching), (2L, AlertStatus.Confirmed)], open.Select(a => (a.Id, a.Status)));
        var confirmed = open.Single(a => a.Id == 2);
        Assert.Equal((T0, T0, (DateTimeOffset?)null, 3, "exact copy"), (confirmed.ConfirmedAt!.Value, confirmed.LastNotifiedAt!.Value, confirmed.ClearedAt, confirmed.ConsecutiveRuns, confirmed.Message));
        var cleared = Assert.Single(await store.ListAlertsAsync(T0.AddDays(-1), 10, CancellationToken.None), a => !a.IsOpen);
        Assert.Equal((3L, AlertStatus.Cleared, T0.AddHours(-10), T0.AddHours(-8)), (cleared.Id, cleared.Status, cleared.ConfirmedAt!.Value, cleared.ClearedAt!.Value));
        var entry = Assert.Single(await new OutboxStore(Database).ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None));
        Assert.Equal(("dw-old@driftwatch.local", "data-team", "an old subject"), (entry.MessageId, entry.MailingList, entry.Subject));

        // Ids keep rising past the deleted alert (they are shown to people for `alerts ack`).
        var saved = await store.ApplyCycleAsync(
            new CycleDecision(T0, [new AlertState(0, "invoices", FindingKind.NullSurge, Severity.Warning, AlertStatus.Watching, 1, T0, T0, null, null, null, null, "nulls", null)], []),
            [],
            null,
            CancellationToken.None);
        Assert.True(saved[0].Id > 4, $"new id {saved[0].Id} must exceed the deleted 4");

        await using var check = await Database.OpenAsync(CancellationToken.None);
        // The open-alert index holds under the new closed state: a second open (orders, slope_shift) is refused,
        // a second cleared one is not.
        await Assert.ThrowsAnyAsync<Exception>(() => check.ExecuteAsync(
            "INSERT INTO alerts (pair, kind, severity, status, consecutive_runs, first_seen_ms, last_seen_ms, message) VALUES ('orders', 'slope_shift', 'warning', 'confirmed', 1, 0, 0, 'twin')"));
        await check.ExecuteAsync(
            "INSERT INTO alerts (pair, kind, severity, status, consecutive_runs, first_seen_ms, last_seen_ms, cleared_at_ms, message) VALUES ('orders', 'became_perfect', 'critical', 'cleared', 1, 0, 0, 0, 'again')");
        // The CHECK constraint takes the new states only.
        foreach (var old in OldStates)
        {
            await Assert.ThrowsAnyAsync<Exception>(() => check.ExecuteAsync(
                "INSERT INTO alerts (pair, kind, severity, status, consecutive_runs, first_seen_ms, last_seen_ms, message) VALUES ('x', 'sign_flip', 'info', @old, 1, 0, 0, 'old')", new { old }));
        }

        Assert.Equal(1, await check.ExecuteScalarAsync<int>(Database.Dialect == StoreDialect.Sqlite
            ? "SELECT COUNT(*) FROM sqlite_master WHERE type = 'index' AND name = 'ix_alerts_cleared' AND tbl_name = 'alerts'"
            : "SELECT COUNT(*) FROM pg_indexes WHERE indexname = 'ix_alerts_cleared' AND tablename = 'alerts'"));
    }

    [GeneratedRegex(@"status\s+TEXT\s+NOT NULL CHECK \(status IN \(([^)]*)\)\)")]
    private static partial Regex StatusCheck();
}

public sealed class SqliteAlertVocabularyMigrationTests() : AlertVocabularyMigrationContract(new SqliteStoreDatabaseFactory());

[Collection(UsesPostgres.Name)]
public sealed class PostgresAlertVocabularyMigrationTests(PostgresServer server) : AlertVocabularyMigrationContract(new PostgresStoreDatabaseFactory(server));
