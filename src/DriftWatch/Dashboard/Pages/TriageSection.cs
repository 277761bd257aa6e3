using System.Globalization;
using DriftWatch.Core.History;
using DriftWatch.Dashboard.Data;
using DriftWatch.Output;
using DriftWatch.Store;
using DriftWatch.Triage;

namespace DriftWatch.Dashboard.Pages;

/// <summary>
/// The pair page's actions and audit log: acknowledge an open alert, snooze or unsnooze the pair, accept a run as
/// the baseline, reset the baseline, each a POST form carrying the session's CSRF token; below, who did what, when
/// and why. Without a session the forms give way to a sign-in link.
/// </summary>
internal static class TriageSection
{
    public const string AnchorId = "triage";

    public static void Render(Html html, PageContext context, PairDetail detail, TriagePanel panel)
    {
        ArgumentNullException.ThrowIfNull(html);
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(detail);
        ArgumentNullException.ThrowIfNull(panel);
        var name = detail.Summary.Name;
        var basePath = "/pairs/" + Uri.EscapeDataString(name);
        html.Open("section", ("class", "card triage"), ("id", AnchorId), ("aria-labelledby", "triage-title"));
        html.Element("h2", "Triage", ("id", "triage-title"));
        Status(html, panel);
        if (!panel.Configured)
        {
            html.Element("p", "This pair is not in the configuration any more: there is nothing to act on.", ("class", "muted"));
        }
        else if (!panel.SignedIn)
        {
            html.Open("p", ("class", "muted sign-in-to-act"));
            html.Text("To acknowledge, snooze or change the baseline, ");
            html.Link("/login?next=" + Uri.EscapeDataString(basePath + "#" + AnchorId), "sign in");
            html.Text(" (the audit log records who acted).");
            html.Close("p");
        }
        else
        {
            html.Element("p", panel.ActorName is { } who
                ? $"Acting as {who}{(panel.NameFromProxy ? " (named by the proxy)" : string.Empty)}. Every action below is recorded with your name, the time and the reason."
                : "Every action below is recorded with the name you give, the time and the reason.", ("class", "muted acting-as"));
            Ack(html, panel, detail, basePath);
            Snooze(html, panel, basePath);
            Baseline(html, panel, detail, basePath);
        }

        Audit(html, panel);
        html.Close("section");
    }

    private static void Status(Html html, TriagePanel panel)
    {
        if (panel.Snooze is { } snooze)
        {
            html.Element("p", $"Snoozed until {Display.Time(snooze.Until)}{(snooze.Reason is { } r ? ": " + r : string.Empty)}. Notifications are held back; states are still tracked.",
                ("class", "callout snoozed"), ("role", "status"));
        }

        if (panel.BaselineResetAt is { } reset)
        {
            html.Element("p", $"The baseline was reset {Display.Time(reset)}: the next one is pooled from runs started after that.",
                ("class", "callout baseline-reset"), ("role", "status"));
        }
    }

    private static void Ack(Html html, TriagePanel panel, PairDetail detail, string basePath)
    {
        var open = detail.Summary.OpenAlerts;
        html.Element("h3", "Acknowledge an alert");
        if (open.Count == 0)
        {
            html.Element("p", "No open alert.", ("class", "muted"));
            return;
        }

        html.Open("ul", ("class", "triage-alerts"));
        foreach (var alert in open.OrderByDescending(a => a.Severity).ThenBy(a => a.Id))
        {
            html.Open("li", ("data-alert-id", alert.Id.ToString(CultureInfo.InvariantCulture)));
            Form(html, panel, basePath + "/ack", "ack-" + alert.Id.ToString(CultureInfo.InvariantCulture), () =>
            {
                html.Open("input", ("type", "hidden"), ("name", "alert_id"), ("value", alert.Id.ToString(CultureInfo.InvariantCulture)));
                html.Element("span", $"#{alert.Id.ToString(CultureInfo.InvariantCulture)} ", ("class", "alert-id"));
                Badges.Severity(html, alert.Severity);
                html.Element("span", " " + Badges.Kind(alert.Kind) + " · " + Output.JsonContract.Name(alert.Status)
                    + (alert.AckedAt is { } acked ? " · acknowledged " + Display.Time(acked) : string.Empty));
                Reason(html, required: false);
                html.Element("button", "Acknowledge", ("type", "submit"));
            });
            html.Close("li");
        }

        html.Close("ul");
    }

    private static void Snooze(Html html, TriagePanel panel, string basePath)
    {
        html.Element("h3", "Snooze notifications");
        Form(html, panel, basePath + "/snooze", "snooze", () =>
        {
            html.Open("label", ("class", "field"));
            html.Element("span", "For (30m, 8h, 2d; at most 31d)");
            html.Open("input", ("type", "text"), ("name", "for"), ("value", "8h"), ("required", string.Empty), ("pattern", "[0-9]+[smhdw]"), ("size", "6"));
            html.Close("label");
            Reason(html, required: true);
            html.Element("button", panel.Snooze is null ? "Snooze" : "Snooze again (replaces the current one)", ("type", "submit"));
        });
        if (panel.Snooze is not null)
        {
            Form(html, panel, basePath + "/unsnooze", "unsnooze", () =>
            {
                Reason(html, required: false);
                html.Element("button", "End the snooze now", ("type", "submit"));
            });
        }
    }

    private static void Baseline(Html html, TriagePanel panel, PairDetail detail, string basePath)
    {
        html.Element("h3", "Baseline");
        var candidates = detail.Runs.Where(r => r.Status == RunStatus.Succeeded).ToArray();
        if (candidates.Length == 0)
        {
            html.Element("p", "No successful run on this page of the history to accept.", ("class", "muted"));
        }
        else
        {
            Form(html, panel, basePath + "/baseline/accept", "accept", () =>
            {
                html.Open("label", ("class", "field field-wide"));
                html.Element("span", "Accept this run as the baseline");
                html.Open("select", ("name", "run_id"), ("required", string.Empty));
                foreach (var run in candidates)
                {
                    var worst = run.WorstSeverity is { } w ? Output.JsonContract.Name(w) + " findings" : "no findings";
                    var text = $"run {run.Id.ToString(CultureInfo.InvariantCulture)} · {Display.Time(run.StartedAt)} · r {Figures.Correlation(run.Profile?.PearsonR)} · {worst}";
                    html.Element("option", text, ("value", run.Id.ToString(CultureInfo.InvariantCulture)));
                }

                html.Close("select");
                html.Close("label");
                html.Open("label", ("class", "check"));
                html.Open("input", ("type", "checkbox"), ("name", "force"), ("value", "true"));
                html.Text(" even though it has warning or critical findings (they are the intended change)");
                html.Close("label");
                Reason(html, required: true);
                html.Element("button", "Accept as baseline", ("type", "submit"));
            });
        }

        Form(html, panel, basePath + "/baseline/reset", "reset", () =>
        {
            html.Element("span", "Reset: forget the baseline; the next one is pooled from runs after now, not from stored runs. ", ("class", "muted"));
            Reason(html, required: true);
            html.Element("button", "Reset baseline", ("type", "submit"));
        });
    }

    private static void Form(Html html, TriagePanel panel, string action, string id, Action fields)
    {
        html.Open("form", ("method", "post"), ("action", action), ("class", "triage-form"), ("id", "form-" + id));
        html.Open("input", ("type", "hidden"), ("name", "csrf"), ("value", panel.CsrfToken));
        if (panel.ActorName is null)
        {
            html.Open("label", ("class", "field"));
            html.Element("span", "Your name");
            html.Open("input", ("type", "text"), ("name", "actor"), ("required", string.Empty), ("maxlength", Actor.MaxNameLength.ToString(CultureInfo.InvariantCulture)));
            html.Close("label");
        }

        fields();
        html.Close("form");
    }

    private static void Reason(Html html, bool required)
    {
        html.Open("label", ("class", "field field-wide"));
        html.Element("span", required ? "Why" : "Why (optional)");
        html.Open("input", ("type", "text"), ("name", "reason"), ("maxlength", AuditStore.MaxReasonLength.ToString(CultureInfo.InvariantCulture)), ("required", required ? string.Empty : null));
        html.Close("label");
    }

    private static void Audit(Html html, TriagePanel panel)
    {
        html.Element("h3", "Audit log");
        if (panel.Audit.Count == 0)
        {
            html.Element("p", "Nobody has acted on this pair yet.", ("class", "muted"));
            return;
        }

        html.Open("table", ("id", "audit"), ("class", "data"));
        html.Open("thead").Open("tr");
        foreach (var head in new[] { "When", "Who", "Via", "Action", "Alert", "Run", "Why", "Detail" })
        {
            html.Element("th", head, ("scope", "col"));
        }

        html.Close("tr").Close("thead");
        html.Open("tbody");
        foreach (var e in panel.Audit)
        {
            html.Open("tr", ("data-action", AuditStore.Name(e.Action)));
            html.Open("td").Element("time", Display.Time(e.At), ("datetime", Display.Iso(e.At))).Close("td");
            html.Element("td", e.Actor);
            html.Element("td", e.Via);
            html.Element("td", AuditStore.Name(e.Action).Replace('_', ' '));
            html.Element("td", e.AlertId is { } a ? "#" + a.ToString(CultureInfo.InvariantCulture) : string.Empty);
            html.Element("td", e.RunId?.ToString(CultureInfo.InvariantCulture) ?? string.Empty);
            html.Element("td", e.Reason ?? string.Empty);
            html.Element("td", e.Detail ?? string.Empty);
            html.Close("tr");
        }

        html.Close("tbody");
        html.Close("table");
    }
}
