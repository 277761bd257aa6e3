using System.Globalization;
using DriftWatch.Core.Alerting;
using DriftWatch.Output;

namespace DriftWatch.Dashboard.Pages;

/// <summary>A table of alerts with their lifecycle times; shared by the alerts page and the pair page.</summary>
internal static class AlertsTable
{
    public static void Render(Html html, PageContext context, IReadOnlyList<AlertState> alerts, bool showPair, string id)
    {
        html.Open("div", ("class", "table-wrap"));
        html.Open("table", ("class", "grid"), ("id", id));
        html.Open("thead").Open("tr");
        var headers = new List<string>();
        if (showPair)
        {
            headers.Add("Pair");
        }

        headers.AddRange(["Kind", "Severity", "Status", "First seen (UTC)", "Confirmed", "Last notified", "Cleared", "Acknowledged", "Runs in a row", "Message"]);
        foreach (var header in headers)
        {
            html.Element("th", header, ("scope", "col"));
        }

        html.Close("tr").Close("thead");
        html.Open("tbody");
        foreach (var alert in alerts)
        {
            html.Open("tr", ("data-status", Output.JsonContract.Name(alert.Status)));
            if (showPair)
            {
                html.Open("td");
                var link = context.Links.Pair(alert.Pair);
                if (link is null)
                {
                    html.Text(alert.Pair);
                }
                else
                {
                    html.Link(link, alert.Pair);
                }

                html.Close("td");
            }

            html.Element("td", Badges.Kind(alert.Kind));
            html.Open("td");
            Badges.Severity(html, alert.Severity);
            html.Close("td");
            html.Open("td");
            Badges.AlertStatus(html, alert.Status);
            html.Close("td");
            TimeCell(html, context, alert.FirstSeen);
            TimeCell(html, context, alert.ConfirmedAt);
            TimeCell(html, context, alert.LastNotifiedAt);
            TimeCell(html, context, alert.ClearedAt);
            TimeCell(html, context, alert.AckedAt);
            html.Element("td", Figures.Count(alert.ConsecutiveRuns), ("class", "num"));
            html.Element("td", alert.Message, ("class", "message"));
            html.Close("tr");
        }

        html.Close("tbody");
        html.Close("table");
        html.Close("div");
    }

    public static void TimeCell(Html html, PageContext context, DateTimeOffset? at)
    {
        html.Open("td", ("class", "when"));
        if (at is { } t)
        {
            // The header says UTC; the cell stays narrow so the message column keeps its room.
            html.Element("time", Display.Time(t)[..^4], ("datetime", Display.Iso(t)), ("title", Display.Time(t)));
            if (context.Live)
            {
                html.Element("span", Display.Relative(t, context.Now), ("class", "sub"));
            }
        }
        else
        {
            html.Element("span", Figures.Missing, ("class", "muted"));
        }

        html.Close("td");
    }
}
