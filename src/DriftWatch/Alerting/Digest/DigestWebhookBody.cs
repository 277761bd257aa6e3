using System.Globalization;
using System.Text;
using System.Text.Json;
using DriftWatch.Alerting.Routing;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Configuration;
using DriftWatch.Output;

namespace DriftWatch.Alerting.Digest;

/// <summary>
/// The body a webhook mailing list posts for one digest: the full document (<see cref="DigestDocument"/>) or the text
/// form (<see cref="TextForm"/>) that the incoming webhooks of common chat tools accept. Composed once, when the cycle
/// is stored; the outbox keeps these bytes and every attempt posts them unchanged. Same Message-Id as a mail of the
/// same digest would have (<see cref="MessageIds"/>): it is the delivery id receivers drop repeats by.
/// </summary>
internal static class DigestWebhookBody
{
    public const string NoSampledValues =
        "This message carries summary figures only, no sampled data values and no plot. The dashboard page it links to " +
        "shows a scatter plot of rows sampled from the source (sampled data values), to people who can sign in.";

    /// <summary>Beyond this many alerts the text form lists the first ones and says how many more there are.</summary>
    public const int MaxTextLines = 20;

    public static OutboxMessage Compose(AddressedDigest digest, Uri? publicUrl, DateTimeOffset at)
    {
        ArgumentNullException.ThrowIfNull(digest);
        ArgumentOutOfRangeException.ThrowIfZero(digest.Items.Count);
        var document = Document(digest, publicUrl, at);
        var bytes = digest.List.Format == WebhookFormat.Text
            ? JsonSerializer.SerializeToUtf8Bytes(TextForm(document), JsonContract.CompactOptions)
            : JsonSerializer.SerializeToUtf8Bytes(document, JsonContract.CompactOptions);
        return new OutboxMessage(document.Id, digest.List.Name, digest.List.Channel, at, document.Subject, [], bytes);
    }

    public static DigestDocument Document(AddressedDigest digest, Uri? publicUrl, DateTimeOffset at)
    {
        ArgumentNullException.ThrowIfNull(digest);
        var items = DigestOrder.Sort(digest.Items);
        var pairs = items
            .GroupBy(i => i.Alert.Pair, StringComparer.Ordinal)
            .Select(group => Pair(group.First().Context, [.. group], DigestComposer.DashboardUrl(publicUrl, group.Key)))
            .ToArray();
        return new DigestDocument(
            DigestDocument.DocumentType,
            DigestDocument.CurrentVersion,
            MessageIds.ForDigest(digest.List.Name, at, items),
            digest.List.Name,
            at,
            DigestSubject.For(items),
            DigestCautions.Summary(items),
            pairs,
            [DigestCautions.Signals, NoSampledValues]);
    }

    /// <summary>
    /// The text form: a plain <c>text</c> field (what chat tools show) and a few key figures per alert for a receiver
    /// that wants them. The text names each alert, its r and slope baseline against now, the dashboard link and the cautions.
    /// </summary>
    public static DigestTextForm TextForm(DigestDocument document)
    {
        ArgumentNullException.ThrowIfNull(document);
        var text = new StringBuilder();
        text.Append(document.Subject).Append('\n').Append(document.Summary).Append('\n');
        var alerts = new List<DigestTextAlert>();
        var lines = 0;
        var total = document.Pairs.Sum(p => p.Alerts.Count);
        foreach (var pair in document.Pairs)
        {
            var r = pair.Figures.FirstOrDefault(f => f.Name == "pearson_r");
            var slope = pair.Figures.FirstOrDefault(f => f.Name == "slope");
            foreach (var alert in pair.Alerts)
            {
                alerts.Add(new DigestTextAlert(pair.Pair, alert.Kind, alert.Severity, alert.State, r?.Baseline, r?.Current, slope?.Baseline, slope?.Current, pair.DashboardUrl));
                if (lines++ >= MaxTextLines)
                {
                    continue;
                }

                var badge = alert.State == AlertStatus.Cleared ? "CLEARED" : AlertWording.SeverityLabel(alert.Severity);
                text.Append("• [").Append(badge).Append("] ").Append(pair.Pair).Append(": ").Append(alert.Headline);
                if (alert.State != AlertStatus.Cleared)
                {
                    text.Append(" (").Append(alert.Notice).Append(')');
                }

                if (r is not null)
                {
                    text.Append(" · r ").Append(r.BaselineText).Append(" → ").Append(r.CurrentText);
                }

                if (slope is not null)
                {
                    text.Append(" · slope ").Append(slope.BaselineText).Append(" → ").Append(slope.CurrentText);
                }

                if (pair.DashboardUrl is { } url)
                {
                    text.Append(" · ").Append(url);
                }

                text.Append('\n');
            }
        }

        if (total > MaxTextLines)
        {
            text.Append(string.Create(CultureInfo.InvariantCulture, $"… and {total - MaxTextLines} more (see the dashboard or the full document form).\n"));
        }

        foreach (var caution in document.Cautions)
        {
            text.Append(caution).Append('\n');
        }

        return new DigestTextForm(text.ToString().TrimEnd('\n'), document.Type + ".text", document.Version, document.Id, document.MailingList, document.CycleAt, alerts);
    }

    private static DigestDocumentPair Pair(AlertPairContext context, IReadOnlyList<DigestItem> items, string? dashboardUrl)
    {
        var pair = context.Pair;
        var figures = DigestFigures.Rows(context)
            .Select(f => new DigestDocumentFigure(f.Key, f.Name, f.BaselineValue, f.CurrentValue, f.Baseline, f.Current))
            .ToArray();
        var alerts = items
            .Select(i => new DigestDocumentAlert(
                i.Alert.Id > 0 ? i.Alert.Id : null,
                i.Alert.Kind,
                AlertWording.Headline(i.Alert.Kind),
                i.Alert.Severity,
                i.Alert.Status,
                AlertWording.Transition(i.Notification.Kind),
                i.Alert.Message,
                i.Alert.FirstSeen,
                i.Alert.ConfirmedAt,
                i.Alert.ClearedAt,
                i.Alert.ConsecutiveRuns))
            .ToArray();
        return new DigestDocumentPair(
            pair.Name,
            pair.Source,
            pair.Table,
            pair.X,
            pair.Y,
            dashboardUrl,
            dashboardUrl is null ? null : dashboardUrl + "#triage",
            context.Current?.Equation,
            alerts,
            figures);
    }
}

/// <summary>The text form of a digest: <c>text</c> first, then compact key figures.</summary>
internal sealed record DigestTextForm(
    string Text,
    string Type,
    int Version,
    string Id,
    string MailingList,
    DateTimeOffset CycleAt,
    IReadOnlyList<DigestTextAlert> Alerts);

/// <summary>One alert of the text form with its key figures (r and slope, baseline and now).</summary>
internal sealed record DigestTextAlert(
    string Pair,
    Core.Findings.FindingKind Kind,
    Core.Findings.Severity Severity,
    AlertStatus State,
    double? RBaseline,
    double? RNow,
    double? SlopeBaseline,
    double? SlopeNow,
    string? DashboardUrl);
