using System.Globalization;
using System.Net;
using System.Net.Sockets;
using System.Security.Cryptography;
using System.Text;
using System.Text.Json;
using DriftWatch.Alerting.Channels;
using DriftWatch.Alerting.Channels.Webhook;
using DriftWatch.Alerting.Digest;
using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using static DriftWatch.IntegrationTests.Alerting.AlertHarness;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>
/// The webhook channel against a real HTTP receiver on 127.0.0.1 (<see cref="LoopbackWebhook"/>), through the real
/// outbox on SQLite: what arrives, its signature (checked here by code of its own, not the channel's), and what each
/// answer does to the message (delivered, retried, failed for good).
/// </summary>
public sealed class WebhookDeliveryTests : IDisposable
{
    private const string Secret = "receiver-and-sender-share-this";

    private static readonly OutboxOptions Retries = new() { RetryBase = TimeSpan.FromMinutes(1), RetryMax = TimeSpan.FromMinutes(10), Jitter = 0.5, Lease = TimeSpan.FromMinutes(5) };

    private readonly TemporarySqliteStore _file = new();

    public void Dispose() => _file.Dispose();

    private static AlertingConfig Config(Uri url, WebhookFormat format = WebhookFormat.Full) => new()
    {
        MailingLists = [new MailingListConfig { Name = "ops-hook", Channel = ChannelKind.Webhook, Url = url, Secret = Secret, Format = format }],
        PublicUrl = new Uri("http://127.0.0.1:8087/"),
    };

    /// <summary>
    /// The receiver's side of docs/alerting.md, written independently of the channel: HMAC-SHA256 through the
    /// HMACSHA256 instance API over the ASCII "timestamp." followed by the raw body, compared as lowercase hex.
    /// </summary>
    private static bool SignatureHolds(ReceivedPost post)
    {
        using var hmac = new HMACSHA256(Encoding.UTF8.GetBytes(Secret));
        var signed = Encoding.ASCII.GetBytes(post.Timestamp + ".").Concat(post.Body).ToArray();
        var expected = string.Concat(hmac.ComputeHash(signed).Select(b => b.ToString("x2", CultureInfo.InvariantCulture)));
        return CryptographicOperations.FixedTimeEquals(Encoding.ASCII.GetBytes(expected), Encoding.ASCII.GetBytes(post.Signature ?? ""));
    }

    [Fact]
    public async Task Dispatch_Digest_ArrivesSignedWithTheStableIdAndTheDocument()
    {
        using var receiver = LoopbackWebhook.Start();
        var harness = new AlertHarness(await _file.OpenAsync(), Config(receiver.Url), Retries);
        await harness.CycleAsync((Pair("weights"), [Critical(FindingKind.BecamePerfect, "weighed_kg became an exact copy of declared_kg")]));

        var result = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal((1, 0), (result.Sent, result.Failed));
        var stored = Assert.Single(await harness.Outbox.ListOutboxAsync(unsentOnly: false, 10, CancellationToken.None));
        Assert.True(stored.IsSent);
        var post = Assert.Single(receiver.Received);
        Assert.Equal("POST", post.Method);
        Assert.Equal("application/json; charset=utf-8", post.ContentType);
        Assert.Equal(stored.MessageId, post.DeliveryId);
        Assert.Equal(harness.Time.GetUtcNow().ToUnixTimeSeconds().ToString(CultureInfo.InvariantCulture), post.Timestamp);
        Assert.True(SignatureHolds(post), "the signature does not verify with the shared secret");

        var json = JsonDocument.Parse(post.Body).RootElement;
        Assert.Equal(("driftwatch.digest", stored.MessageId, "ops-hook"), (json.GetProperty("type").GetString(), json.GetProperty("id").GetString(), json.GetProperty("mailing_list").GetString()));
        Assert.Equal(Start, json.GetProperty("cycle_at").GetDateTimeOffset());
        var pair = Assert.Single(json.GetProperty("pairs").EnumerateArray());
        Assert.Equal("weights", pair.GetProperty("pair").GetString());
        Assert.Equal("http://127.0.0.1:8087/pairs/weights", pair.GetProperty("dashboard_url").GetString());
        var alert = Assert.Single(pair.GetProperty("alerts").EnumerateArray());
        Assert.Equal(("became_perfect", "critical", "confirmed", "new", "weighed_kg became an exact copy of declared_kg"), (
            alert.GetProperty("kind").GetString(), alert.GetProperty("severity").GetString(), alert.GetProperty("state").GetString(),
            alert.GetProperty("notice").GetString(), alert.GetProperty("message").GetString()));
        // The harness's figures: Anscombe (1973) set I, r = 0.816 and slope 0.500 (values from memory).
        var r = pair.GetProperty("figures").EnumerateArray().Single(f => f.GetProperty("name").GetString() == "pearson_r");
        Assert.Equal((0.816, 0.816), (r.GetProperty("baseline").GetDouble(), r.GetProperty("current").GetDouble()));
        Assert.Contains(DigestCautions.Signals, json.GetProperty("cautions").EnumerateArray().Select(c => c.GetString()));
        // The harness's sampled points (Anscombe's y values) never leave with the post.
        var text = Encoding.UTF8.GetString(post.Body);
        foreach (var sampled in (string[])["12.74", "10.84", "8.81", "4.26"])
        {
            Assert.DoesNotContain(sampled, text, StringComparison.Ordinal);
        }
    }

    [Fact]
    public async Task Dispatch_ReceiverRefusesConnectionsThenComesBack_EachDigestArrivesOnceWithItsId()
    {
        var port = LoopbackSmtp.FreePort();
        var harness = new AlertHarness(await _file.OpenAsync(), Config(new Uri($"http://127.0.0.1:{port}/hooks/driftwatch")), Retries);

        // Two cycles confirm alerts of two pairs while nothing listens on the port.
        for (var i = 0; i < 2; i++)
        {
            await harness.CycleAsync((Pair($"pair_{i}"), [Critical(FindingKind.BecamePerfect, $"pair {i} became exact")]));
            var down = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
            Assert.Equal(0, down.Sent);
            harness.Time.Advance(TimeSpan.FromMinutes(1));
        }

        var held = await harness.Outbox.ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None);
        Assert.Equal(2, held.Count);
        // Tried ones carry the error (a list's later messages in the same pass are deferred untried); none is failed for good.
        Assert.Contains(held, e => e.Attempts >= 1 && e.LastError!.Contains("unavailable", StringComparison.Ordinal));
        Assert.All(held, e => Assert.Null(e.FailedAt));

        using var receiver = LoopbackWebhook.Start(port);
        // Every retry is due within the cap (10 min) plus the lease (5 min).
        harness.Time.Advance(TimeSpan.FromMinutes(15));
        var recovered = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
        harness.Time.Advance(TimeSpan.FromHours(2));
        var again = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal(2, recovered.Sent);
        Assert.Equal(0, again.Sent + again.Failed);
        Assert.Equal(held.Select(e => e.MessageId).Order(StringComparer.Ordinal), receiver.Received.Select(p => p.DeliveryId!).Order(StringComparer.Ordinal));
        Assert.All(receiver.Received, p => Assert.True(SignatureHolds(p)));
        Assert.Empty(await harness.Outbox.ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None));
    }

    /// <summary>
    /// A receiver that answers 429 or 503 with Retry-After (RFC 9110, section 10.2.3: seconds, or an HTTP date) is not
    /// posted to again before then, up to the longest backoff (10 minutes here); without the header the backoff's
    /// first wait would be at most a minute.
    /// </summary>
    [Theory]
    [InlineData(429, "420", 420)]
    [InlineData(503, "date+300", 300)]
    [InlineData(429, "10800", 600)]
    public async Task Dispatch_ReceiverSaysRetryAfter_NextAttemptWaitsThatLong_CappedAtTheLongestBackoff(int status, string header, int expectedSeconds)
    {
        using var receiver = LoopbackWebhook.Start();
        var harness = new AlertHarness(await _file.OpenAsync(), Config(receiver.Url), Retries);
        var asked = header.StartsWith("date+", StringComparison.Ordinal)
            ? (harness.Time.GetUtcNow() + TimeSpan.FromSeconds(int.Parse(header[5..], CultureInfo.InvariantCulture))).ToString("r", CultureInfo.InvariantCulture)
            : header;
        receiver.AnswerNext(status, "slow down", retryAfter: asked);
        await harness.CycleAsync((Pair("weights"), [Critical(FindingKind.SignFlip, "flipped")]));
        var start = harness.Time.GetUtcNow();

        var first = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
        var waiting = Assert.Single(await harness.Outbox.ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None));
        harness.Time.Advance(TimeSpan.FromSeconds(expectedSeconds - 1));
        var early = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
        harness.Time.Advance(TimeSpan.FromSeconds(1));
        var due = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal((0, 1), (first.Sent, first.Failed));
        Assert.Equal(start + TimeSpan.FromSeconds(expectedSeconds), waiting.NextAttemptAt);
        Assert.Equal(0, early.Sent + early.Failed);
        Assert.Equal((1, 0), (due.Sent, due.Failed));
        Assert.Equal([status, 200], receiver.Received.Select(p => p.Answered));
    }

    /// <summary>
    /// Retry-After speaks for the receiver, not for one post: the list's other messages are not posted before then
    /// either, though their leases (5 minutes here) run out sooner, and they are all due when the wait ends.
    /// </summary>
    [Fact]
    public async Task Dispatch_ReceiverSaysRetryAfter_TheListsOtherMessagesWaitToo()
    {
        using var receiver = LoopbackWebhook.Start();
        var harness = new AlertHarness(await _file.OpenAsync(), Config(receiver.Url), Retries);
        receiver.AnswerNext(429, "slow down", retryAfter: "420");
        await harness.CycleAsync((Pair("weights"), [Critical(FindingKind.SignFlip, "flipped")]));
        await harness.CycleAsync((Pair("volumes"), [Critical(FindingKind.BecamePerfect, "became exact")]));
        var start = harness.Time.GetUtcNow();

        var first = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
        var held = await harness.Outbox.ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None);
        harness.Time.Advance(TimeSpan.FromMinutes(6));
        var afterLease = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
        harness.Time.Advance(TimeSpan.FromMinutes(1));
        var due = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal((0, 1, 1), (first.Sent, first.Failed, first.Deferred));
        Assert.Equal(2, held.Count);
        Assert.All(held, e => Assert.Equal(start + TimeSpan.FromSeconds(420), e.NextAttemptAt));
        Assert.Equal(0, afterLease.Sent + afterLease.Failed);
        Assert.Equal(2, due.Sent);
        Assert.Equal([429, 200, 200], receiver.Received.Select(p => p.Answered));
    }

    [Theory]
    [InlineData(503)]
    [InlineData(429)]
    [InlineData(408)]
    public async Task Dispatch_ReceiverAnswersNotNow_RetriesTheSameBodyAndIdUntilTaken(int status)
    {
        using var receiver = LoopbackWebhook.Start();
        receiver.AnswerNext(status, "busy");
        var harness = new AlertHarness(await _file.OpenAsync(), Config(receiver.Url), Retries);
        await harness.CycleAsync((Pair("weights"), [Critical(FindingKind.SignFlip, "flipped")]));

        var first = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
        var waiting = Assert.Single(await harness.Outbox.ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None));
        harness.Time.Advance(TimeSpan.FromMinutes(15));
        var retried = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
        harness.Time.Advance(TimeSpan.FromHours(2));
        var after = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal((0, 1), (first.Sent, first.Failed));
        Assert.Contains($"unavailable: HTTP {status}", waiting.LastError, StringComparison.Ordinal);
        Assert.Null(waiting.FailedAt);
        Assert.Equal((1, 0), (retried.Sent, retried.Failed));
        Assert.Equal(0, after.Sent + after.Failed);
        var posts = receiver.Received;
        Assert.Equal([status, 200], posts.Select(p => p.Answered));
        Assert.Equal([waiting.MessageId, waiting.MessageId], posts.Select(p => p.DeliveryId));
        Assert.Equal(posts[0].Body, posts[1].Body);
        // Each attempt is signed for its own time; both verify.
        Assert.NotEqual(posts[0].Timestamp, posts[1].Timestamp);
        Assert.All(posts, p => Assert.True(SignatureHolds(p)));
    }

    [Theory]
    [InlineData(400, "Bad Request")]
    [InlineData(404, "Not Found")]
    [InlineData(301, "Moved Permanently")]
    public async Task Dispatch_ReceiverRefusesTheMessage_MarksItFailedAndNeverPostsItAgain(int status, string phrase)
    {
        using var receiver = LoopbackWebhook.Start();
        receiver.AnswerNext(status, "unknown field \"pairs\"\nsee the receiver's log");
        var harness = new AlertHarness(await _file.OpenAsync(), Config(receiver.Url), Retries);
        await harness.CycleAsync((Pair("weights"), [Critical(FindingKind.SignFlip, "flipped")]));

        var first = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);
        harness.Time.Advance(TimeSpan.FromDays(1));
        var later = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal((0, 1), (first.Sent, first.Failed));
        Assert.Equal(0, later.Sent + later.Failed);
        Assert.Single(receiver.Received);
        Assert.Empty(await harness.Outbox.ListOutboxAsync(unsentOnly: true, 10, CancellationToken.None));
        var failed = Assert.Single(await harness.Outbox.ListOutboxAsync(unsentOnly: false, 10, CancellationToken.None));
        Assert.Equal((Start, (DateTimeOffset?)null, 1), (failed.FailedAt, failed.SentAt, failed.Attempts));
        Assert.Equal(
            $"Webhook http://127.0.0.1:{receiver.Port} of mailing list 'ops-hook' refused message {failed.MessageId}: HTTP {status} {phrase}: unknown field \"pairs\" see the receiver's log",
            failed.LastError);
    }

    [Fact]
    public async Task Dispatch_TextFormat_PostsAPlainTextFieldWithTheCautions()
    {
        using var receiver = LoopbackWebhook.Start();
        var harness = new AlertHarness(await _file.OpenAsync(), Config(receiver.Url, WebhookFormat.Text), Retries);
        await harness.CycleAsync((Pair("weights"), [Critical(FindingKind.BecamePerfect, "exact")]));

        await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        var post = Assert.Single(receiver.Received);
        Assert.True(SignatureHolds(post));
        var text = JsonDocument.Parse(post.Body).RootElement.GetProperty("text").GetString()!;
        Assert.StartsWith("DriftWatch · weights: became perfect (critical)\n1 alert needs a look.\n• [CRITICAL] weights: became perfect (new) · r ", text, StringComparison.Ordinal);
        Assert.Contains(" · http://127.0.0.1:8087/pairs/weights\n", text, StringComparison.Ordinal);
        Assert.EndsWith(DigestCautions.Signals + "\n" + DigestWebhookBody.NoSampledValues, text, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Send_ReceiverAcceptsButNeverAnswers_TimesOutAsUnavailable()
    {
        // A socket that accepts the connection and then says nothing: the post waits for its timeout.
        using var silent = new TcpListener(IPAddress.Loopback, 0);
        silent.Start();
        var port = ((IPEndPoint)silent.LocalEndpoint).Port;
        var list = new MailingListConfig { Name = "ops-hook", Channel = ChannelKind.Webhook, Url = new Uri($"http://127.0.0.1:{port}/"), Secret = Secret, Timeout = TimeSpan.FromSeconds(1) };
        var entry = new OutboxEntry(1, "dw-silent@driftwatch.local", "ops-hook", ChannelKind.Webhook, Start, Start, 0, null, null, "s", [], "{}"u8.ToArray());
        using var channel = new WebhookAlertChannel(TimeProvider.System);

        var error = await Assert.ThrowsAsync<ChannelUnavailableException>(() => channel.SendAsync(entry, list, CancellationToken.None));

        Assert.Equal($"Webhook http://127.0.0.1:{port} of mailing list 'ops-hook' did not answer within 1 s", error.Message);
    }

    [Fact]
    public async Task Dispatch_MailQueuedBeforeTheListBecameAWebhook_IsRecordedFailedNotPostedAsJson()
    {
        using var receiver = LoopbackWebhook.Start();
        var database = await _file.OpenAsync();
        var asFiles = new AlertingConfig { MailingLists = [new MailingListConfig { Name = "ops-hook", Channel = ChannelKind.File, Directory = Path.Combine(_file.Folder, "mail") }] };
        await new AlertHarness(database, asFiles).CycleAsync((Pair("weights"), [Critical(FindingKind.SignFlip, "flipped")]));
        var harness = new AlertHarness(database, Config(receiver.Url), Retries);

        var result = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal((0, 1), (result.Sent, result.Failed));
        Assert.Empty(receiver.Received);
        var failed = Assert.Single(await harness.Outbox.ListOutboxAsync(unsentOnly: false, 10, CancellationToken.None));
        Assert.NotNull(failed.FailedAt);
        Assert.Equal($"Message {failed.MessageId} was composed for the file channel, but mailing list 'ops-hook' now sends by webhook; it cannot be sent in that form.", failed.LastError);
    }
}
