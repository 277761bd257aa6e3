using Dapper;
using DriftWatch.Core.Configuration;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Store;

namespace DriftWatch.IntegrationTests.Store;

/// <summary>
/// Migration 011 on a store last migrated by an older release (scripts up to 009): queued outbox rows are kept with
/// every column (claims included) and their ids are never handed out again; the outbox accepts channel 'webhook' and
/// still refuses an unknown one; a message marked failed for good is never claimed again.
/// </summary>
public abstract class WebhookOutboxMigrationContract : IAsyncLifetime
{
    private static readonly DateTimeOffset T0 = new(2026, 3, 1, 8, 0, 0, TimeSpan.Zero);

    private readonly IStoreDatabaseFactory _factory;

    private protected WebhookOutboxMigrationContract(IStoreDatabaseFactory factory) => _factory = factory;

    private IStoreDatabase Database { get; set; } = null!;

    public async Task InitializeAsync()
    {
        Database = await _factory.CreateAsync();
        await using var connection = await Database.OpenAsync(CancellationToken.None);
        await connection.ExecuteAsync("CREATE TABLE schema_migrations (version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at_ms BIGINT NOT NULL)");
        foreach (var script in MigrationRunner.LoadScripts(Database.Dialect).Where(s => s.Version <= 9))
        {
            await connection.ExecuteAsync(script.Sql);
            await connection.ExecuteAsync("INSERT INTO schema_migrations (version, name, applied_at_ms) VALUES (@Version, @Name, 0)", new { script.Version, script.Name });
        }
    }

    public async Task DisposeAsync() => await _factory.DisposeAsync();

    [Fact]
    public async Task Migrate_OldStore_KeepsQueuedMessagesAndAcceptsWebhookRows()
    {
        var t0 = T0.ToUnixTimeMilliseconds();
        const string Insert =
            "INSERT INTO outbox (message_id, mailing_list, channel, created_at_ms, next_attempt_at_ms, attempts, last_error, subject, recipients, mime, claimed_by) " +
            "VALUES (@id, 'data-team', @channel, @t0, @t0, @attempts, @error, 'a subject', '[\"data@example.org\"]', @mime, @owner)";
        await using (var connection = await Database.OpenAsync(CancellationToken.None))
        {
            await connection.ExecuteAsync(Insert, new { id = "dw-queued@driftwatch.local", channel = "smtp", t0, attempts = 2, error = "server down", mime = new byte[] { 1, 2, 3 }, owner = "worker-a" });
            await connection.ExecuteAsync(Insert, new { id = "dw-pruned@driftwatch.local", channel = "file", t0, attempts = 0, error = (string?)null, mime = new byte[] { 4 }, owner = (string?)null });
            await connection.ExecuteAsync("DELETE FROM outbox WHERE message_id = 'dw-pruned@driftwatch.local'");
            // Before 011 the outbox has no room for a webhook message.
            await Assert.ThrowsAnyAsync<Exception>(() => connection.ExecuteAsync(Insert, new { id = "dw-early@driftwatch.local", channel = "webhook", t0, attempts = 0, error = (string?)null, mime = new byte[] { 5 }, owner = (string?)null }));
        }

        var applied = await new MigrationRunner(Database).MigrateAsync(CancellationToken.None);

        Assert.Equal(["010_several_workers", "011_webhook_outbox", "012_window_end", "013_slot_claims", "014_column_hints"], applied);
        var outbox = new OutboxStore(Database);
        var kept = Assert.Single(await outbox.ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None));
        Assert.Equal((1L, "dw-queued@driftwatch.local", ChannelKind.Smtp, 2, "server down", (DateTimeOffset?)null), (kept.Id, kept.MessageId, kept.Channel, kept.Attempts, kept.LastError, kept.FailedAt));
        // The claim's owner came along: the worker that held it takes it back.
        Assert.Equal(1, await outbox.TakeBackClaimsAsync("worker-a", T0, CancellationToken.None));

        await using var check = await Database.OpenAsync(CancellationToken.None);
        await check.ExecuteAsync(Insert, new { id = "dw-hook@driftwatch.local", channel = "webhook", t0, attempts = 0, error = (string?)null, mime = "{}"u8.ToArray(), owner = (string?)null });
        await Assert.ThrowsAnyAsync<Exception>(() => check.ExecuteAsync(Insert, new { id = "dw-odd@driftwatch.local", channel = "pigeon", t0, attempts = 0, error = (string?)null, mime = new byte[] { 6 }, owner = (string?)null }));
        // Ids keep counting past the deleted row's: an id shown in a log never names another message.
        var hook = await check.ExecuteScalarAsync<long>("SELECT id FROM outbox WHERE message_id = 'dw-hook@driftwatch.local'");
        Assert.True(hook > 2, $"the webhook row got id {hook}, at or below the deleted row's 2");

        var claimed = await outbox.ClaimDueAsync(T0, TimeSpan.FromMinutes(1), "worker-b", 10, CancellationToken.None);
        Assert.Equal(["dw-queued@driftwatch.local", "dw-hook@driftwatch.local"], claimed.Select(e => e.MessageId));
        await outbox.MarkGivenUpAsync(hook, "HTTP 400 Bad Request", T0, CancellationToken.None);
        await outbox.TakeBackClaimsAsync("worker-b", T0, CancellationToken.None);

        var again = await outbox.ClaimDueAsync(T0.AddHours(1), TimeSpan.FromMinutes(1), "worker-b", 10, CancellationToken.None);
        Assert.Equal(["dw-queued@driftwatch.local"], again.Select(e => e.MessageId));
        var failed = (await outbox.ListOutboxAsync(unsentOnly: false, 10, CancellationToken.None)).Single(e => e.Id == hook);
        Assert.Equal((T0, "HTTP 400 Bad Request", 1, "failed"), (failed.FailedAt, failed.LastError, failed.Attempts, failed.IsFailed ? "failed" : "other"));
        Assert.DoesNotContain(await outbox.ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None), e => e.Id == hook);
        // Kept for audit as long as sent messages, then pruned with them.
        Assert.Equal(0, await outbox.PruneSentAsync(T0, CancellationToken.None));
        Assert.Equal(1, await outbox.PruneSentAsync(T0.AddMilliseconds(1), CancellationToken.None));
    }
}

public sealed class SqliteWebhookOutboxMigrationTests() : WebhookOutboxMigrationContract(new SqliteStoreDatabaseFactory());

[Collection(UsesPostgres.Name)]
public sealed class PostgresWebhookOutboxMigrationTests(PostgresServer server) : WebhookOutboxMigrationContract(new PostgresStoreDatabaseFactory(server));
