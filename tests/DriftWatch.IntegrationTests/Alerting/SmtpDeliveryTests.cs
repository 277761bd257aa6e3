using System.Buffers.Binary;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using MimeKit;
using SkiaSharp;
using static DriftWatch.IntegrationTests.Alerting.AlertHarness;

namespace DriftWatch.IntegrationTests.Alerting;

/// <summary>From findings to a message received by a real SMTP server (netDumbster) over loopback, through a real SQLite store.</summary>
public sealed class SmtpDeliveryTests : IDisposable
{
    private readonly TemporarySqliteStore _file = new();

    [Fact]
    public async Task Cycle_CriticalFindings_DeliverOneDigestPerMailingListWithPartsAndInlinePlot()
    {
        using var server = LoopbackSmtp.Start();
        var harness = new AlertHarness(await _file.OpenAsync(), Smtp(LoopbackSmtp.Port(server),
            MailingList("data-team", "data@example.org", "Analyst <analyst@example.org>"),
            MailingList("owners", "owners@example.org")));
        var weights = Pair("weighed_vs_declared");
        var fuel = Pair("fuel_vs_distance", "distance_km", "fuel_l");

        await harness.CycleAsync(
            (weights, [Critical(FindingKind.BecamePerfect, "weighed_kg now equals declared_kg on every sampled row")]),
            (fuel, [Critical(FindingKind.SignFlip, "fuel_l now falls as distance_km grows")]));
        var dispatched = await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal(2, dispatched.Sent);
        var received = await LoopbackSmtp.WaitForAsync(server, 2);
        Assert.Equal(2, received.Count);
        var team = Assert.Single(received, m => m.To.Mailboxes.Any(a => a.Address == "data@example.org"));
        Assert.Equal(["data@example.org", "analyst@example.org"], team.To.Mailboxes.Select(a => a.Address));
        Assert.Equal("driftwatch@example.org", team.From.Mailboxes.Single().Address);
        // Both critical and new; ties order by pair name, so fuel_vs_distance is the one the subject names.
        Assert.Equal("DriftWatch · fuel_vs_distance: sign flipped (critical) +1 more", team.Subject);
        Assert.Equal(team.Subject, server.ReceivedEmail.Single(m => m.ToAddresses.Any(a => a.Address == "data@example.org")).Subject);

        var plain = Assert.Single(team.BodyParts.OfType<TextPart>(), p => p.IsPlain).Text;
        var html = Assert.Single(team.BodyParts.OfType<TextPart>(), p => p.IsHtml).Text;
        Assert.Contains("weighed_kg now equals declared_kg on every sampled row", plain, StringComparison.Ordinal);
        Assert.Contains("weighed_kg now equals declared_kg on every sampled row", html, StringComparison.Ordinal);
        Assert.Contains("http://127.0.0.1:8087/pairs/weighed_vs_declared", html, StringComparison.Ordinal);

        var images = team.BodyParts.OfType<MimePart>().Where(p => p.ContentType.IsMimeType("image", "png")).ToArray();
        Assert.Equal(2, images.Length);
        foreach (var image in images)
        {
            Assert.Contains($"cid:{image.ContentId}", html, StringComparison.Ordinal);
            AssertPng(image, ScatterPlotRendererSize.Width, ScatterPlotRendererSize.Height);
        }
    }

    [Fact]
    public async Task Cycle_HostileColumnName_NeverAppearsRawInTheReceivedHtml()
    {
        using var server = LoopbackSmtp.Start();
        var harness = new AlertHarness(await _file.OpenAsync(), Smtp(LoopbackSmtp.Port(server), MailingList("team", "team@example.org")));
        var hostile = Pair("evil_pair", x: "<script>alert(1)</script>", y: "amount");

        await harness.CycleAsync((hostile, [Critical(FindingKind.BecamePerfect, "amount equals <script>alert(1)</script> exactly")]));
        await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        var message = Assert.Single(await LoopbackSmtp.WaitForAsync(server, 1));
        var html = Assert.Single(message.BodyParts.OfType<TextPart>(), p => p.IsHtml).Text;
        Assert.DoesNotContain("<script>", html, StringComparison.OrdinalIgnoreCase);
        Assert.Contains("&lt;script&gt;alert(1)&lt;/script&gt;", html, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Cycle_ClearedAlert_SendsAnAllClearNotice()
    {
        using var server = LoopbackSmtp.Start();
        var harness = new AlertHarness(await _file.OpenAsync(), Smtp(LoopbackSmtp.Port(server), MailingList("team", "team@example.org")));
        var weights = Pair("weighed_vs_declared");
        await harness.CycleAsync((weights, [Critical(FindingKind.BecamePerfect, "exact copy")]));

        harness.Time.Advance(TimeSpan.FromHours(1));
        var clean = await harness.CycleAsync((weights, []));
        await harness.Dispatcher.DispatchDueAsync(CancellationToken.None);

        Assert.Equal(NotificationKind.Cleared, Assert.Single(clean.Decision.Notifications).Kind);
        var received = await LoopbackSmtp.WaitForAsync(server, 2);
        Assert.Equal(
            ["DriftWatch · weighed_vs_declared: became perfect (cleared)", "DriftWatch · weighed_vs_declared: became perfect (critical)"],
            received.Select(m => m.Subject).Order(StringComparer.Ordinal));
    }

    public void Dispose() => _file.Dispose();

    private static void AssertPng(MimePart image, int width, int height)
    {
        using var stream = new MemoryStream();
        image.Content!.DecodeTo(stream);
        var png = stream.ToArray();
        // PNG specification (ISO/IEC 15948) section 5.2 signature, 11.2.2 IHDR width/height; then SkiaSharp decodes it.
        Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A }, png[..8]);
        Assert.Equal(width, BinaryPrimitives.ReadInt32BigEndian(png.AsSpan(16, 4)));
        Assert.Equal(height, BinaryPrimitives.ReadInt32BigEndian(png.AsSpan(20, 4)));
        using var bitmap = SKBitmap.Decode(png);
        Assert.Equal((width, height), (bitmap.Width, bitmap.Height));
    }

    private static class ScatterPlotRendererSize
    {
        public const int Width = DriftWatch.Plots.ScatterPlotRenderer.DefaultWidth;
        public const int Height = DriftWatch.Plots.ScatterPlotRenderer.DefaultHeight;
    }
}
