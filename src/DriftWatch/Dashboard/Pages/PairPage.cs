using System.Globalization;
using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Dashboard.Data;
using DriftWatch.Output;

namespace DriftWatch.Dashboard.Pages;

/// <summary>
/// One pair: what its latest check found, how the latest sample looks over the baseline, how r moved over
/// time, the baseline and the configuration it is checked with, and the run history.
/// </summary>
internal static class PairPage
{
    /// <param name="triage">The actions and audit section; null leaves it out (the static export).</param>
    public static string Render(PageContext context, PairDetail detail, TriagePanel? triage = null)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(detail);
        var summary = detail.Summary;
        return PageLayout.Render(context, summary.Name, null, html =>
        {
            Heading(html, context, summary);
            Findings(html, detail);
            OpenAlerts(html, context, detail);
            Plots(html, detail);
            html.Open("div", ("class", "facts"));
            BaselineFacts.Render(html, summary);
            ConfigFacts.Render(html, summary);
            html.Close("div");
            HistoryTable.Render(html, context, detail);
            if (triage is not null)
            {
                TriageSection.Render(html, context, detail, triage);
            }
        });
    }

    private static void Heading(Html html, PageContext context, PairSummary summary)
    {
        html.Open("nav", ("class", "crumbs"), ("aria-label", "Breadcrumb"));
        html.Link(context.Links.Overview, "Pairs");
        html.Element("span", " / ", ("aria-hidden", "true"));
        html.Element("span", summary.Name, ("aria-current", "page"));
        html.Close("nav");

        html.Open("div", ("class", "page-head pair-head"));
        html.Open("h1");
        html.Open("span", ("class", "pair-title")).Name(summary.Name).Close("span");
        html.Text(" ");
        Badges.Status(html, summary.Status);
        html.Close("h1");
        html.Open("p", ("class", "lede"));
        if (summary.Config is { } config)
        {
            html.Element("strong", config.X);
            html.Text(" vs ");
            html.Element("strong", config.Y);
            html.Text(" · source ");
            html.Element("strong", config.Source);
        }
        else
        {
            html.Text("This pair is not in the configuration any more; its history is still in the store.");
        }

        if (summary.Latest is { } latest)
        {
            html.Text(" · last checked ");
            if (context.Live)
            {
                html.Element("time", Display.Relative(latest.StartedAt, context.Now), ("datetime", Display.Iso(latest.StartedAt)), ("title", Display.Time(latest.StartedAt)));
                html.Text(" (" + Display.Time(latest.StartedAt) + ")");
            }
            else
            {
                html.Element("time", Display.Time(latest.StartedAt), ("datetime", Display.Iso(latest.StartedAt)));
            }
        }
        else
        {
            html.Text(" · not checked yet");
        }

        html.Close("p");
        html.Close("div");

        if (summary.Latest is { Status: RunStatus.Failed } failed)
        {
            html.Open("div", ("class", "callout callout-failing"), ("role", "status"));
            html.Element("strong", "The latest check failed: ");
            html.Text(failed.Error ?? "no error message was recorded");
            html.Close("div");
        }
        else if (summary.Latest is { Status: RunStatus.Unmeasurable } empty)
        {
            // Same look as a failed check (nobody is watching the relationship), its own words: the check did run.
            html.Open("div", ("class", "callout callout-failing callout-unmeasurable"), ("role", "status"));
            html.Element("strong", "Unmeasurable: the latest check had nothing to measure. ");
            html.Text(empty.Error ?? "no reason was recorded");
            html.Text(" It counts toward the check-failing alert and clears no alert.");
            html.Close("div");
        }
    }

    private static void Findings(Html html, PairDetail detail)
    {
        var summary = detail.Summary;
        var latest = summary.Latest;
        if (latest is null || latest.Status != RunStatus.Succeeded)
        {
            return;
        }

        html.Open("section", ("class", "card findings"), ("aria-labelledby", "findings-title"));
        html.Element("h2", "What the latest check found", ("id", "findings-title"));
        if (latest.Findings.Count == 0)
        {
            html.Element("p", NoFindingsText(detail), ("class", "muted"));
        }
        else
        {
            html.Open("ul", ("class", "finding-list"));
            foreach (var finding in latest.Findings.OrderByDescending(f => f.Severity))
            {
                html.Open("li", ("class", "finding sev-row-" + Output.JsonContract.Name(finding.Severity)));
                Badges.Severity(html, finding.Severity);
                html.Element("span", Badges.Kind(finding.Kind), ("class", "finding-kind"));
                html.Element("span", finding.Message, ("class", "finding-message"));
                var figures = FindingFigures(finding);
                if (figures is not null)
                {
                    html.Element("span", figures, ("class", "finding-figures"));
                }

                html.Close("li");
            }

            html.Close("ul");
        }

        if (WindowEndText(latest) is { } ended)
        {
            html.Element("p", ended, ("class", "muted window-end"));
        }

        if (latest.JudgedAgainst is { } judged)
        {
            html.Element("p", JudgedAgainstText(latest, judged), ("class", "muted judged-against"));
        }

        html.Close("section");
    }

    /// <summary>Where the run's window ended (the check time, or the newest load with anchor latest), and whether the run is back-dated.</summary>
    internal static string? WindowEndText(Core.History.RunRecord run)
    {
        ArgumentNullException.ThrowIfNull(run);
        var ended = run.WindowEnd is { } end ? $"Window ended at {Display.TimeWithSeconds(end)}." : null;
        var backDated = run.BackDatedAt is { } made
            ? $"Back-dated run: checked on {Display.TimeWithSeconds(made)} as of {Display.TimeWithSeconds(run.StartedAt)}; it never raises or mails an alert."
            : null;
        return ended is null && backDated is null ? null : string.Join(" ", new[] { ended, backDated }.Where(t => t is not null));
    }

    /// <summary>The baseline this run was compared with, as recorded with the run, and the window's exact row count.</summary>
    private static string JudgedAgainstText(Core.History.RunRecord run, Core.History.BaselineSummary b)
    {
        var window = run.SourceFigures is { } f ? $"The window held {Figures.Number(f.RowCount)} rows. " : string.Empty;
        return $"{window}Judged against the baseline built {Display.Time(b.CreatedAt)} from {Figures.Count(b.RunCount)} runs"
            + $" ({Display.Time(b.CoversFrom)} to {Display.Time(b.CoversTo)}{(b.Accepted ? ", accepted" : string.Empty)}):"
            + $" r {Figures.Number(b.PearsonR)}, slope {Figures.Number(b.Slope)}, about {Figures.Number(b.Rows)} rows per run.";
    }

    /// <summary>Only a pair with a baseline can look "as it did"; without one, say what is still missing.</summary>
    internal static string NoFindingsText(PairDetail detail)
    {
        ArgumentNullException.ThrowIfNull(detail);
        if (detail.Summary.Baseline is not null)
        {
            return "No findings: the relationship looks as it did in the baseline.";
        }

        var lead = "No findings in this run's own profile. There is no baseline yet, so nothing was compared";
        if (detail.BaselineRunsNeeded is { } needed && detail.Summary.Config?.Baseline is { } policy)
        {
            return needed == 0
                ? $"{lead}; the baseline ({policy}) is built at the next check."
                : $"{lead}; the baseline ({policy}) needs {Figures.Count(needed)} more measurable run{(needed == 1 ? "" : "s")}.";
        }

        return lead + ".";
    }

    private static string? FindingFigures(Finding finding)
    {
        var parts = new List<string>();
        if (finding.Effect is { } effect)
        {
            parts.Add("effect " + Figures.Number(effect));
        }

        if (finding.PValue is { } p)
        {
            parts.Add("p " + (p < 1e-4 ? "< 0.0001" : "= " + Figures.Number(p)));
        }

        return parts.Count == 0 ? null : string.Join(" · ", parts);
    }

    private static void OpenAlerts(Html html, PageContext context, PairDetail detail)
    {
        var alerts = detail.RecentAlerts;
        if (alerts.Count == 0)
        {
            return;
        }

        html.Open("section", ("class", "card"), ("aria-labelledby", "pair-alerts-title"));
        html.Open("h2", ("id", "pair-alerts-title"));
        html.Text("Alerts of this pair ");
        html.Link(context.Links.Alerts, "all alerts", ("class", "aside-link"));
        html.Close("h2");
        AlertsTable.Render(html, context, alerts, showPair: false, id: "pair-alerts");
        html.Close("section");
    }

    private static void Plots(Html html, PairDetail detail)
    {
        html.Open("section", ("class", "plots"), ("aria-label", "Plots"));
        var scatter = PairPlots.ScatterModel(detail);
        html.Open("figure", ("class", "card plot-card"), ("id", "scatter"));
        html.Open("figcaption");
        html.Element("h2", "Latest sample over the baseline");
        html.Element("p", ScatterSource(detail), ("class", "muted"));
        html.Close("figcaption");
        html.Raw(PairPlots.Scatter(scatter));
        html.Element("p", scatter.Caption, ("class", "plot-caption"));
        html.Close("figure");
        html.Close("section");

        var trends = PairPlots.TrendModels(detail);
        var shown = detail.Trend.Count(r => r.Status == RunStatus.Succeeded);
        html.Open("section", ("class", "card trends"), ("id", "trend"), ("aria-labelledby", "trend-title"));
        html.Element("h2", "Figures over time", ("id", "trend-title"));
        html.Element(
            "p",
            $"The latest {Figures.Count(shown)} successful runs. Shaded band: the range the baseline's runs make normal; "
            + "markers: runs with findings, by worst severity (▲ warning, ◆ critical, ○ info). Read the charts together: which figure stepped tells what changed.",
            ("class", "muted"));
        html.Open("div", ("class", "trend-grid"));
        foreach (var trend in trends)
        {
            html.Open("figure", ("class", "trend-chart"), ("id", trend.Id));
            html.Raw(PairPlots.Trend(trend));
            html.Element("figcaption", trend.Caption, ("class", "plot-caption"));
            html.Close("figure");
        }

        html.Close("div");
        html.Close("section");
    }

    private static string ScatterSource(PairDetail detail)
    {
        var current = detail.PlotRun is { } run
            ? $"The run of {Display.Time(run.StartedAt)}"
            : "No recent run still has its sampled points";
        var baseline = detail.Summary.Baseline is { } b
            ? $"the baseline's reservoir of {Figures.Count(b.Points.UsedCount)} points from {Figures.Count(b.RunCount)} runs"
            : "no baseline yet";
        return $"{current} over {baseline}.";
    }
}
