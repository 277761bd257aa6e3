using System.Globalization;
using DriftWatch.Core.Alerting;
using DriftWatch.Dashboard.Data;
using DriftWatch.Output;

namespace DriftWatch.Dashboard.Pages;

/// <summary>Open and recently cleared alerts with their lifecycle times, and the delivery state of every queued message.</summary>
internal static class AlertsPage
{
    public static string Render(PageContext context, AlertsOverview overview)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(overview);
        return PageLayout.Render(context, "Alerts", PageLayout.NavAlerts, html =>
        {
            html.Open("div", ("class", "page-head"));
            html.Element("h1", "Alerts");
            html.Element("p", "One alert per pair and finding kind, from first sighting until a check shows it gone. An alert is confirmed once enough runs in a row carry it; until then it is watching. Info findings stay watching: they are shown, never sent.", ("class", "lede"));
            html.Close("div");

            html.Open("section", ("class", "tally"), ("aria-label", "Alerts by state"));
            Tile(html, overview.Open.Count(a => a.Status == AlertStatus.Confirmed), "confirmed", "st-confirmed");
            Tile(html, overview.Open.Count(a => a.Status == AlertStatus.Watching), "watching", "st-watching");
            Tile(html, overview.Cleared.Count, "cleared in 7 days", "st-healthy");
            Tile(html, overview.Deliveries.Count(d => !d.IsSent), "unsent", overview.Deliveries.Any(d => !d.IsSent && (d.Attempts > 0 || d.IsFailed)) ? "st-failing" : "st-no_runs");
            html.Close("section");

            html.Open("section", ("class", "card"), ("aria-labelledby", "open-title"));
            html.Element("h2", "Open", ("id", "open-title"));
            if (overview.Open.Count == 0)
            {
                html.Element("p", "No open alerts.", ("class", "muted"));
            }
            else
            {
                AlertsTable.Render(html, context, overview.Open, showPair: true, id: "open-alerts");
            }

            html.Close("section");

            html.Open("section", ("class", "card"), ("aria-labelledby", "cleared-title"));
            html.Element("h2", "Cleared since " + Display.Time(overview.ClearedSince), ("id", "cleared-title"));
            if (overview.Cleared.Count == 0)
            {
                html.Element("p", "None.", ("class", "muted"));
            }
            else
            {
                AlertsTable.Render(html, context, overview.Cleared, showPair: true, id: "cleared-alerts");
            }

            html.Close("section");
            Deliveries(html, context, overview.Deliveries);
        });
    }

    /// <summary>
    /// "sent", "queued" (not tried yet), "retrying" (failed at least once, will try again), "failed" (the receiver
    /// refused it for good; not tried again).
    /// </summary>
    public static string DeliveryState(OutboxEntry entry)
    {
        ArgumentNullException.ThrowIfNull(entry);
        return entry.IsSent ? "sent" : entry.IsFailed ? "failed" : entry.Attempts == 0 ? "queued" : "retrying";
    }

    private static void Tile(Html html, int n, string label, string css)
    {
        html.Open("div", ("class", "tile " + css + (n == 0 ? " tile-zero" : string.Empty)));
        html.Element("span", Figures.Count(n), ("class", "tile-n"));
        html.Element("span", label, ("class", "tile-label"));
        html.Close("div");
    }

    private static void Deliveries(Html html, PageContext context, IReadOnlyList<OutboxEntry> deliveries)
    {
        html.Open("section", ("class", "card"), ("aria-labelledby", "deliveries-title"));
        html.Element("h2", "Deliveries", ("id", "deliveries-title"));
        html.Element("p", "Messages written to the outbox with the alert changes they announce, and how sending them went.", ("class", "muted"));
        if (deliveries.Count == 0)
        {
            html.Element("p", "Nothing was queued.", ("class", "muted"));
            html.Close("section");
            return;
        }

        html.Open("div", ("class", "table-wrap"));
        html.Open("table", ("class", "grid"), ("id", "deliveries"));
        html.Open("thead").Open("tr");
        foreach (var header in new[] { "Queued (UTC)", "Mailing list", "Channel", "Subject", "Recipients", "State", "Attempts", "Sent / next attempt", "Last error" })
        {
            html.Element("th", header, ("scope", "col"));
        }

        html.Close("tr").Close("thead");
        html.Open("tbody");
        foreach (var entry in deliveries)
        {
            var state = DeliveryState(entry);
            html.Open("tr", ("data-delivery", state));
            AlertsTable.TimeCell(html, context, entry.CreatedAt);
            html.Element("td", entry.MailingList);
            html.Element("td", JsonContract.Name(entry.Channel));
            html.Element("td", entry.Subject, ("class", "message"));
            html.Element("td", string.Join(", ", entry.Recipients));
            html.Open("td").Element("span", state, ("class", "delivery dl-" + state)).Close("td");
            html.Element("td", Figures.Count(entry.Attempts), ("class", "num"));
            AlertsTable.TimeCell(html, context, entry.SentAt ?? entry.NextAttemptAt);
            html.Element("td", entry.LastError ?? Figures.Missing, ("class", entry.LastError is null ? "muted" : "error-line"));
            html.Close("tr");
        }

        html.Close("tbody");
        html.Close("table");
        html.Close("div");
        html.Close("section");
    }
}
