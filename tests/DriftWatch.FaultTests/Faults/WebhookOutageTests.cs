using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using DriftWatch.FaultTests.Infrastructure;
using DriftWatch.IntegrationTests.Alerting;
using DriftWatch.IntegrationTests.Infrastructure;

namespace DriftWatch.FaultTests.Faults;

/// <summary>
/// A webhook receiver is down (nothing listens on its port) when an alert is confirmed, then comes back on the same
/// port: the worker, a real process, posts each digest once it can, signed, with its stable delivery id, and no
/// post is accepted twice. The mail list beside it is not held up.
/// </summary>
[Collection(UsesPostgres.Name)]
public sealed class WebhookOutageTests(PostgresServer server)
{
    private const string Secret = "fault-bench-hook-secret";

    [Fact]
    public async Task ReceiverDownThenBack_EachDigestPostedOnceWithItsIdAndAValidSignature()
    {
        var port = LoopbackWebhook.FreePort();
        await using var bench = await FaultBench.CreateAsync(server);
        bench.WriteConfig(new WorkerSetup
        {
            Pairs = [new PairSpec("km-vs-litres", FaultBench.SourceTable)],
            CheckFailingAfter = 1,
            ExtraMailingLists = $"""
                    - name: fleet-hook
                      channel: webhook
                      url: http://127.0.0.1:{port}/hooks/driftwatch
                      secret: {Secret}
                      timeout: 5s
                      from_severity: info

                """,
        });
        using var worker = await bench.StartWorkerAsync();

        await bench.StopSourceAsync();
        await Eventually.TrueAsync("a webhook message whose first attempt failed", async _ =>
            (await bench.OutboxAsync()).Any(m => m.Channel == "webhook" && !m.Sent && m.Attempts >= 1), worker.OutputLog);
        var waiting = (await bench.OutboxAsync()).First(m => m.Channel == "webhook" && !m.Sent);
        Assert.StartsWith($"Webhook http://127.0.0.1:{port} of mailing list 'fleet-hook' unavailable: ", waiting.LastError, StringComparison.Ordinal);
        // The mail of the same cycle went out meanwhile: one list's outage holds back no other list.
        var mail = (await bench.OutboxAsync()).First(m => m.Channel == "smtp");
        await Eventually.TrueAsync("the mail of the same cycle delivered", _ => Task.FromResult(bench.Smtp.ReceivedIds.Contains(mail.MessageId)), worker.OutputLog);

        using var receiver = LoopbackWebhook.Start(port);
        await bench.StartSourceAsync();
        await Eventually.TrueAsync("the waiting digest posted", _ => Task.FromResult(receiver.Received.Any(p => p.DeliveryId == waiting.MessageId)), worker.OutputLog);
        await Eventually.TrueAsync("the check-failing alert cleared", async _ => (await bench.CheckFailingAlertsAsync("km-vs-litres")) is [.., { Status: "cleared" }], worker.OutputLog);
        await bench.WaitAllSentAsync(4, worker.OutputLog);

        await worker.TerminateAsync();
        Assert.Equal(0, await worker.WaitForExitAsync(Eventually.Deadline));
        await bench.AssertEveryMailOnceAsync();
        var hooks = (await bench.OutboxAsync()).Where(m => m.Channel == "webhook").ToList();
        var posts = receiver.Received;
        var context = $"outbox: {string.Join(", ", hooks)}; posts: {string.Join(", ", posts.Select(p => p.DeliveryId))}";
        // Every webhook message the outbox marks sent was posted exactly once, and nothing else was.
        Assert.True(hooks.Count >= 2 && hooks.All(m => m.Sent), context);
        Assert.Equal(hooks.Select(m => m.MessageId).Order(StringComparer.Ordinal), posts.Select(p => p.DeliveryId!).Order(StringComparer.Ordinal));
        Assert.All(posts, p => Assert.True(SignatureHolds(p), "signature of " + p.DeliveryId));
    }

    /// <summary>The receiver's check of docs/alerting.md, by code of its own: HMAC-SHA256 over "timestamp." and the raw body.</summary>
    private static bool SignatureHolds(ReceivedPost post)
    {
        using var hmac = new HMACSHA256(Encoding.UTF8.GetBytes(Secret));
        var expected = string.Concat(hmac.ComputeHash([.. Encoding.ASCII.GetBytes(post.Timestamp + "."), .. post.Body]).Select(b => b.ToString("x2", CultureInfo.InvariantCulture)));
        return string.Equals(expected, post.Signature, StringComparison.Ordinal);
    }
}
