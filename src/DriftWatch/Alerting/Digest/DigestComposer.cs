using DriftWatch.Alerting.Routing;
using DriftWatch.Core.Alerting;
using DriftWatch.Plots;
using MimeKit;

namespace DriftWatch.Alerting.Digest;

/// <summary>
/// Turns one mailing list's items of one cycle into one message. The body is MimeKit's <see cref="BodyBuilder"/>
/// layout: multipart/alternative of text/plain and a multipart/related holding the text/html and the inline
/// PNG plots (Content-Id referenced as <c>cid:</c>), so a plain-text reader does not list the plots as
/// attachments. Pure apart from rendering: the caller passes the time and every figure.
/// </summary>
internal static class DigestComposer
{
    public static MimeMessage Compose(AddressedDigest digest, DigestOptions options, DateTimeOffset at)
    {
        ArgumentNullException.ThrowIfNull(digest);
        ArgumentNullException.ThrowIfNull(options);
        ArgumentOutOfRangeException.ThrowIfZero(digest.Items.Count);
        var list = digest.List;
        var items = DigestOrder.Sort(digest.Items);
        var messageId = MessageIds.ForDigest(list.Name, at, items);
        var subject = DigestSubject.For(items);

        var builder = new BodyBuilder();
        var sections = new List<PairSection>();
        var plots = 0;
        foreach (var group in items.GroupBy(i => i.Alert.Pair, StringComparer.Ordinal))
        {
            var context = group.First().Context;
            string? contentId = null;
            string? note = null;
            string? caption = null;
            if (list.IncludePlot && HasPoints(context))
            {
                if (plots < DigestOptions.MaxPlotsPerMessage)
                {
                    contentId = MessageIds.ForPlot(messageId, context.Pair.Name, plots + 1);
                    (note, caption) = AttachPlot(builder, context, contentId, plots + 1);
                    contentId = note is null ? contentId : null;
                    plots += note is null ? 1 : 0;
                }
                else
                {
                    note = $"Plot left out: this message already carries {DigestOptions.MaxPlotsPerMessage} plots.";
                }
            }

            sections.Add(new PairSection(context, [.. group], contentId, note, DashboardUrl(options.PublicUrl, context.Pair.Name), caption));
        }

        var model = new DigestModel(subject, list.Name, at, sections, plots > 0);
        builder.TextBody = DigestPlainText.Render(model);
        builder.HtmlBody = DigestHtml.Render(model);

        var message = new MimeMessage
        {
            MessageId = messageId,
            Date = at,
            Subject = subject,
            Body = builder.ToMessageBody(),
        };
        message.From.Add(MailboxAddress.Parse(options.From));
        foreach (var recipient in list.Recipients)
        {
            message.To.Add(MailboxAddress.Parse(recipient));
        }

        // RFC 3834: machine-sent, so vacation responders stay quiet.
        message.Headers.Add("Auto-Submitted", "auto-generated");
        message.Headers.Add("X-DriftWatch-Mailing-List", list.Name);
        return message;
    }

    /// <summary>The whole message as bytes for the outbox: what is stored is exactly what is sent.</summary>
    public static OutboxMessage ToOutbox(MimeMessage message, AddressedDigest digest, DateTimeOffset at)
    {
        ArgumentNullException.ThrowIfNull(message);
        using var stream = new MemoryStream();
        message.WriteTo(FormatOptions.Default, stream);
        return new OutboxMessage(
            message.MessageId ?? throw new ArgumentException("The message has no Message-Id.", nameof(message)),
            digest.List.Name,
            digest.List.Channel,
            at,
            message.Subject ?? "",
            [.. message.To.Mailboxes.Select(m => m.Address)],
            stream.ToArray());
    }

    public static string? DashboardUrl(Uri? publicUrl, string pair) =>
        publicUrl is null ? null : $"{publicUrl.AbsoluteUri.TrimEnd('/')}/pairs/{Uri.EscapeDataString(pair)}";

    private static bool HasPoints(AlertPairContext context) =>
        context.CurrentPoints is { UsedCount: > 0 } || context.BaselinePoints is { UsedCount: > 0 };

    /// <summary>
    /// Renders and links the plot; returns its caption on success, else a note for the reader (the message still goes
    /// out). The picture is built by the same plot model as the dashboard's.
    /// </summary>
    private static (string? Note, string? Caption) AttachPlot(BodyBuilder builder, AlertPairContext context, string contentId, int index)
    {
        byte[] png;
        string caption;
        try
        {
            var model = ScatterPlotModelBuilder.Build(
                new ScatterPlotInput(context.Pair.X, context.Pair.Y, context.BaselinePoints, context.Baseline, context.CurrentPoints, context.Current),
                context.Pair.Thresholds);
            png = ScatterPlotRenderer.RenderPng(model);
            caption = model.Caption;
        }
        catch (Exception ex) when (ex is not OperationCanceledException)
        {
            // A plot is an illustration; failing to draw it must not hold back the alert.
            return ($"Plot left out: it could not be drawn ({ex.GetType().Name}).", null);
        }

        var fileName = string.Create(System.Globalization.CultureInfo.InvariantCulture, $"plot-{index}.png");
        var image = builder.LinkedResources.Add(fileName, png, new ContentType("image", "png"));
        image.ContentId = contentId;
        image.ContentDisposition = new ContentDisposition(ContentDisposition.Inline) { FileName = fileName };
        return (null, caption);
    }
}
