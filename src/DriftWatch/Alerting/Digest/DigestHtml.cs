using System.Text.Encodings.Web;
using System.Text.Unicode;
using System.Text;
using DriftWatch.Core.Alerting;
using DriftWatch.Output;

namespace DriftWatch.Alerting.Digest;

/// <summary>
/// The HTML body. Inline styles only (mail clients drop style sheets); every value that comes from the
/// configuration or the data (pair and column names, messages, equations) goes through <see cref="H"/>.
/// </summary>
internal static class DigestHtml
{
    private const string Font = "-apple-system,'Segoe UI',Helvetica,Arial,sans-serif";

    // Escapes what HTML needs escaped (< > & " ' and controls) and leaves letters of every script alone.
    private static readonly HtmlEncoder Encoder = HtmlEncoder.Create(UnicodeRanges.All);

    public static string Render(DigestModel model)
    {
        var items = model.Sections.SelectMany(s => s.Items).ToArray();
        var html = new StringBuilder(8 * 1024);
        html.Append("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">")
            .Append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">")
            .Append("<title>").Append(H(model.Subject)).Append("</title></head>\n")
            .Append("<body style=\"margin:0;padding:0;background:#F3F4F6;\">\n")
            .Append("<div style=\"max-width:700px;margin:0 auto;padding:24px 16px;font-family:").Append(Font).Append(";color:#111827;\">\n")
            .Append("<div style=\"font-size:13px;color:#6B7280;\">DriftWatch · mailing list ").Append(H(model.MailingList)).Append(" · ").Append(H(Output.Figures.Time(model.At))).Append("</div>\n")
            .Append("<h1 style=\"font-size:20px;font-weight:600;margin:4px 0 16px;\">").Append(H(DigestCautions.Summary(items))).Append("</h1>\n");

        foreach (var section in model.Sections)
        {
            Section(html, section);
        }

        html.Append("<div style=\"font-size:12px;color:#6B7280;line-height:1.5;margin-top:8px;\">\n")
            .Append("<p style=\"margin:0 0 6px;\">").Append(H(DigestCautions.Signals)).Append("</p>\n");
        if (model.CarriesPlots)
        {
            html.Append("<p style=\"margin:0 0 6px;\">").Append(H(DigestCautions.SampledValues)).Append("</p>\n");
        }

        html.Append("</div>\n</div>\n</body></html>\n");
        return html.ToString();
    }

    private static void Section(StringBuilder html, PairSection section)
    {
        var worst = section.Items[0];
        var accent = worst.IsActive ? AlertWording.SeverityColour(worst.Alert.Severity) : AlertWording.ClearedColour;
        html.Append("<div style=\"background:#FFFFFF;border:1px solid #E5E7EB;border-left:4px solid ").Append(accent)
            .Append(";border-radius:6px;padding:16px 20px;margin:0 0 16px;\">\n")
            .Append("<h2 style=\"font-size:17px;font-weight:600;margin:0 0 2px;word-break:break-word;\">").Append(H(section.Pair)).Append("</h2>\n")
            .Append("<div style=\"font-size:13px;color:#6B7280;margin:0 0 12px;word-break:break-word;\">").Append(H(section.SourceLine)).Append("</div>\n")
            .Append("<ul style=\"list-style:none;padding:0;margin:0 0 12px;\">\n");
        foreach (var item in section.Items)
        {
            Item(html, item);
        }

        html.Append("</ul>\n");

        if (section.Equation is { } equation)
        {
            html.Append("<p style=\"font-size:14px;margin:0 0 12px;\">y is an exact function of x in the current sample: <code style=\"background:#F3F4F6;padding:1px 4px;border-radius:3px;\">")
                .Append(H(equation)).Append("</code></p>\n");
        }

        Figures(html, section);

        if (section.PlotContentId is { } cid)
        {
            var pair = section.Context.Pair;
            html.Append("<img src=\"cid:").Append(H(cid)).Append("\" width=\"640\" style=\"display:block;max-width:100%;height:auto;border:1px solid #E5E7EB;margin:0 0 8px;\" alt=\"")
                .Append(H($"Scatter plot of {pair.Y} against {pair.X}: baseline points grey, current points in colour, both fits"))
                .Append("\">\n");
            if (section.PlotCaption is { } caption)
            {
                html.Append("<p style=\"font-size:13px;color:#4B5563;margin:0 0 8px;max-width:640px;\">").Append(H(caption)).Append("</p>\n");
            }
        }
        else if (section.PlotNote is { } note)
        {
            html.Append("<p style=\"font-size:13px;color:#6B7280;margin:0 0 8px;\">").Append(H(note)).Append("</p>\n");
        }

        if (section.DashboardUrl is { } url)
        {
            html.Append("<p style=\"font-size:14px;margin:8px 0 0;\"><a href=\"").Append(H(url)).Append("\" style=\"color:#0E7490;\">Open ")
                .Append(H(section.Pair)).Append(" on the dashboard</a> (history) · <a href=\"").Append(H(url + "#triage")).Append("\" style=\"color:#0E7490;\">acknowledge, snooze or accept a baseline</a> (after signing in to the dashboard)</p>\n");
        }

        html.Append("</div>\n");
    }

    private static void Item(StringBuilder html, DigestItem item)
    {
        var alert = item.Alert;
        var colour = item.IsActive ? AlertWording.SeverityColour(alert.Severity) : AlertWording.ClearedColour;
        var badge = item.IsActive ? AlertWording.SeverityLabel(alert.Severity) : "CLEARED";
        html.Append("<li style=\"font-size:14px;line-height:1.45;margin:0 0 6px;\">")
            .Append("<span style=\"display:inline-block;font-size:11px;font-weight:700;letter-spacing:0.04em;color:#FFFFFF;background:").Append(colour)
            .Append(";border-radius:3px;padding:1px 6px;margin-right:6px;\">").Append(badge).Append("</span>");
        if (item.IsActive)
        {
            // The CLEARED badge says it all for an all-clear; active ones say whether they are news.
            html.Append("<span style=\"color:#6B7280;\">").Append(H(AlertWording.Transition(item.Notification.Kind))).Append(" · </span>");
        }

        html.Append("<strong>").Append(H(AlertWording.Phrase(alert.Kind))).Append("</strong>: ")
            .Append(H(alert.Message));
        if (item.Notification.Kind is NotificationKind.Reminder or NotificationKind.Escalated && alert.ConfirmedAt is { } confirmed)
        {
            html.Append(" <span style=\"color:#6B7280;\">(confirmed since ").Append(H(Output.Figures.Time(confirmed))).Append(")</span>");
        }

        // The id 'driftwatch alerts ack' and the dashboard's audit log name the alert by (digests are composed after
        // the alert rows are written, in the same transaction; only a digest composed outside the store has none).
        if (alert.Id > 0)
        {
            html.Append(" <span style=\"color:#6B7280;\">(alert #").Append(alert.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)).Append(")</span>");
        }

        if (alert.IsAcked)
        {
            html.Append(" <span style=\"color:#6B7280;\">(acknowledged)</span>");
        }

        html.Append("</li>\n");
    }

    private static void Figures(StringBuilder html, PairSection section)
    {
        const string cell = "padding:4px 10px;border-bottom:1px solid #F3F4F6;";
        html.Append("<table role=\"presentation\" cellspacing=\"0\" cellpadding=\"0\" style=\"border-collapse:collapse;font-size:13px;margin:0 0 12px;\">\n")
            .Append("<tr><th style=\"").Append(cell).Append("text-align:left;color:#6B7280;font-weight:600;\"></th>")
            .Append("<th style=\"").Append(cell).Append("text-align:right;color:#6B7280;font-weight:600;\">baseline</th>")
            .Append("<th style=\"").Append(cell).Append("text-align:right;color:#6B7280;font-weight:600;\">current</th></tr>\n");
        foreach (var row in DigestFigures.Rows(section.Context))
        {
            html.Append("<tr><td style=\"").Append(cell).Append("\">").Append(H(row.Name)).Append("</td>")
                .Append("<td style=\"").Append(cell).Append("text-align:right;font-variant-numeric:tabular-nums;\">").Append(H(row.Baseline)).Append("</td>")
                .Append("<td style=\"").Append(cell).Append("text-align:right;font-variant-numeric:tabular-nums;\">").Append(H(row.Current)).Append("</td></tr>\n");
        }

        html.Append("</table>\n");
    }

    /// <summary>HTML-escapes text and attribute values (&lt; &gt; &amp; " ').</summary>
    private static string H(string text) => Encoder.Encode(text);
}
