using System.Net;
using DriftWatch.Alerting.Digest;
using DriftWatch.Alerting.Routing;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Tests.Plots;
using MimeKit;
using static DriftWatch.Tests.Alerting.AlertSamples;

namespace DriftWatch.Tests.Alerting;

public sealed class DigestComposerTests
{
    private static readonly DigestOptions Options = new("DriftWatch <dw@example.org>", new Uri("https://dw.example.org/"));

    private static AddressedDigest TwoPairs(bool includePlot = true) => new(MailingList(includePlot: includePlot),
    [
        Item(Alert("weighed_vs_declared", FindingKind.BecamePerfect, Severity.Critical, message: "weighed_kg now equals declared_kg on every row"), NotificationKind.Confirmed),
        Item(Alert("weighed_vs_declared", FindingKind.SlopeShift, Severity.Warning, message: "slope moved from 0.50 to 1.00"), NotificationKind.Reminder),
        Item(Alert("fuel_vs_distance", FindingKind.SignFlip, Severity.Critical, AlertStatus.Cleared, "sign is back to positive"), NotificationKind.Cleared),
    ]);

    [Fact]
    public void Compose_Digest_SubjectLeadsWithTheWorstPairAndWhatChanged_ThenCountsTheRest()
    {
        using var message = DigestComposer.Compose(TwoPairs(), Options, At);

        Assert.Equal("DriftWatch · weighed_vs_declared: became perfect (critical) +2 more", message.Subject);
    }

    [Fact]
    public void Compose_ReminderOnly_SubjectSaysReminder()
    {
        var digest = new AddressedDigest(MailingList(), [Item(Alert("weighed_vs_declared", FindingKind.SlopeShift, Severity.Warning), NotificationKind.Reminder)]);

        using var message = DigestComposer.Compose(digest, Options, At);

        Assert.Equal("DriftWatch · weighed_vs_declared: slope changed (warning, reminder)", message.Subject);
    }

    [Fact]
    public void Compose_AllClearsOnly_SubjectSaysCleared()
    {
        var digest = new AddressedDigest(MailingList(), [Item(Alert("fuel_vs_distance", FindingKind.SignFlip, Severity.Critical, AlertStatus.Cleared), NotificationKind.Cleared)]);

        using var message = DigestComposer.Compose(digest, Options, At);

        Assert.Equal("DriftWatch · fuel_vs_distance: sign flipped (cleared)", message.Subject);
    }

    [Fact]
    public void Compose_Digest_AddressesTheMailingListAndIsMarkedMachineSent()
    {
        using var message = DigestComposer.Compose(TwoPairs(), Options, At);

        Assert.Equal(["data-team@example.org", "oncall@example.org"], message.To.Mailboxes.Select(m => m.Address));
        Assert.Equal("dw@example.org", Assert.Single(message.From.Mailboxes).Address);
        // RFC 3834 section 5: auto-generated messages say so.
        Assert.Equal("auto-generated", message.Headers["Auto-Submitted"]);
        Assert.Equal(At, message.Date);
    }

    [Fact]
    public void Compose_WithPlots_InlinesOnePngPerPairReferencedByContentId()
    {
        using var message = DigestComposer.Compose(TwoPairs(), Options, At);

        MimeParts.AssertDigestStructure(message, images: 2);
        var html = MimeParts.Html(message).Text;
        foreach (var image in MimeParts.Images(message))
        {
            Assert.Contains($"src=\"cid:{image.ContentId}\"", html, StringComparison.Ordinal);
            Assert.Equal(ContentDisposition.Inline, image.ContentDisposition?.Disposition);
            Assert.Equal((ScottPlotSize.Width, ScottPlotSize.Height), PngImage.AssertValid(MimeParts.Bytes(image)));
        }

        Assert.Contains(DigestCautions.SampledValues, html, StringComparison.Ordinal);
    }

    [Fact]
    public void Compose_ListWithoutPlots_HasNoImageAndNoSampledDataCaution()
    {
        using var message = DigestComposer.Compose(TwoPairs(includePlot: false), Options, At);

        MimeParts.AssertDigestStructure(message, images: 0);
        Assert.Empty(MimeParts.Images(message));
        Assert.DoesNotContain("cid:", MimeParts.Html(message).Text, StringComparison.Ordinal);
        Assert.DoesNotContain(DigestCautions.SampledValues, MimeParts.Plain(message).Text, StringComparison.Ordinal);
        // The summary figures stay.
        Assert.Contains("0.816", MimeParts.Html(message).Text, StringComparison.Ordinal);
    }

    [Fact]
    public void Compose_BothParts_CarryMessagesFiguresAndTheSignalsCaution()
    {
        using var message = DigestComposer.Compose(TwoPairs(), Options, At);

        foreach (var text in new[] { WebUtility.HtmlDecode(MimeParts.Html(message).Text), MimeParts.Plain(message).Text })
        {
            Assert.Contains("weighed_kg now equals declared_kg on every row", text, StringComparison.Ordinal);
            Assert.Contains("slope moved from 0.50 to 1.00", text, StringComparison.Ordinal);
            Assert.Contains("sign is back to positive", text, StringComparison.Ordinal);
            Assert.Contains("source warehouse, table shipping.parcels", text, StringComparison.Ordinal);
            // The table: baseline and current figures as the samples define them.
            Assert.Contains("0.818", text, StringComparison.Ordinal);
            Assert.Contains("0.991", text, StringComparison.Ordinal);
            Assert.Contains("< 0.001", text, StringComparison.Ordinal);
            Assert.Contains("9.09%", text, StringComparison.Ordinal);
            Assert.Contains("1 (8.33%)", text, StringComparison.Ordinal);
            Assert.Contains(DigestCautions.Signals, text, StringComparison.Ordinal);
        }
    }

    [Fact]
    public void Compose_PublicUrl_LinksEachPairsDashboardPageWithTheNameEncoded()
    {
        var pair = Pair("weighed vs declared & co");
        var digest = new AddressedDigest(MailingList(), [Item(Alert(pair.Name, FindingKind.BecamePerfect, Severity.Critical), NotificationKind.Confirmed, Context(pair))]);

        using var message = DigestComposer.Compose(digest, Options with { PublicUrl = new Uri("https://dw.example.org/watch/") }, At);

        // RFC 3986 percent-encoding of the path segment, then HTML attribute escaping of '&'.
        Assert.Contains("href=\"https://dw.example.org/watch/pairs/weighed%20vs%20declared%20%26%20co\"", MimeParts.Html(message).Text, StringComparison.Ordinal);
        Assert.Contains("Dashboard: https://dw.example.org/watch/pairs/weighed%20vs%20declared%20%26%20co", MimeParts.Plain(message).Text, StringComparison.Ordinal);
    }

    [Fact]
    public void Compose_NoPublicUrl_HasNoDashboardLink()
    {
        using var message = DigestComposer.Compose(TwoPairs(), Options with { PublicUrl = null }, At);

        Assert.DoesNotContain("href=", MimeParts.Html(message).Text, StringComparison.Ordinal);
    }

    [Fact]
    public void Compose_HostileNames_AreEscapedInTheHtml()
    {
        const string hostile = "<script>alert(1)</script>";
        var pair = Pair("<img src=x onerror=alert(2)>", x: hostile, y: "y\"><b>");
        var alert = Alert(pair.Name, FindingKind.BecamePerfect, Severity.Critical, message: $"{hostile} now equals y");
        var digest = new AddressedDigest(MailingList(), [Item(alert, NotificationKind.Confirmed, Context(pair, Current with { Equation = $"y = 1 × {hostile}" }))]);

        using var message = DigestComposer.Compose(digest, Options, At);

        var html = MimeParts.Html(message).Text;
        Assert.DoesNotContain("<script", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("<img src=x", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("y\"><b>", html, StringComparison.Ordinal);
        Assert.Contains("&lt;script&gt;alert(1)&lt;/script&gt;", html, StringComparison.Ordinal);
        // The plain part is text: names appear as they are.
        Assert.Contains(hostile, MimeParts.Plain(message).Text, StringComparison.Ordinal);
    }

    [Fact]
    public void Compose_CurrentProfileWithEquation_ShowsTheDerivedEquation()
    {
        var digest = new AddressedDigest(MailingList(), [Item(Alert("weighed_vs_declared", FindingKind.BecamePerfect, Severity.Critical), NotificationKind.Confirmed, Context(current: Current with { Equation = "weighed_kg = 1.000 × declared_kg + 0.000" }))]);

        using var message = DigestComposer.Compose(digest, Options, At);

        Assert.Contains("<code style=\"background:#F3F4F6;padding:1px 4px;border-radius:3px;\">weighed_kg = 1.000 × declared_kg + 0.000</code>", WebUtility.HtmlDecode(MimeParts.Html(message).Text), StringComparison.Ordinal);
        Assert.Contains("exact function of x in the current sample: weighed_kg = 1.000 × declared_kg + 0.000", MimeParts.Plain(message).Text, StringComparison.Ordinal);
    }

    [Fact]
    public void Compose_SameInputs_GiveTheSameMessageId_AndAnotherCycleAnother()
    {
        using var first = DigestComposer.Compose(TwoPairs(), Options, At);
        using var again = DigestComposer.Compose(TwoPairs(), Options, At);
        using var later = DigestComposer.Compose(TwoPairs(), Options, At.AddHours(1));

        Assert.Equal(first.MessageId, again.MessageId);
        Assert.NotEqual(first.MessageId, later.MessageId);
        Assert.Matches("^dw-[0-9a-f]{24}@driftwatch\\.local$", first.MessageId);
    }

    [Fact]
    public void ToOutbox_RoundTripsTheMessageBytes()
    {
        using var message = DigestComposer.Compose(TwoPairs(), Options, At);

        var row = DigestComposer.ToOutbox(message, TwoPairs(), At);

        using var parsed = MimeMessage.Load(new MemoryStream(row.Mime));
        Assert.Equal(message.MessageId, parsed.MessageId);
        Assert.Equal(message.Subject, parsed.Subject);
        Assert.Equal(row.Subject, parsed.Subject);
        Assert.Equal(["data-team@example.org", "oncall@example.org"], row.Recipients);
        Assert.Equal(2, MimeParts.Images(parsed).Count);
    }

    private static class ScottPlotSize
    {
        public const int Width = DriftWatch.Plots.ScatterPlotRenderer.DefaultWidth;
        public const int Height = DriftWatch.Plots.ScatterPlotRenderer.DefaultHeight;
    }
}
