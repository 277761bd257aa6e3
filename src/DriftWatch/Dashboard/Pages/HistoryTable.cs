using System.Globalization;
using DriftWatch.Core.History;
using DriftWatch.Dashboard.Data;
using DriftWatch.Output;

namespace DriftWatch.Dashboard.Pages;

/// <summary>The pair's runs, newest first, one row each, paged on the server.</summary>
internal static class HistoryTable
{
    private static readonly string[] Headers =
        ["Started", "Outcome", "n", "r", "ρ", "τ-b", "Slope", "Intercept", "Curvature p", "Outliers", "Nulls", "Findings"];

    public static void Render(Html html, PageContext context, PairDetail detail)
    {
        ArgumentNullException.ThrowIfNull(html);
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(detail);
        html.Open("section", ("class", "card history"), ("aria-labelledby", "history-title"), ("id", "history"));
        html.Open("h2", ("id", "history-title"));
        html.Text("History ");
        html.Element("span", RangeText(detail), ("class", "aside"));
        html.Close("h2");
        html.Open("div", ("class", "table-wrap"));
        html.Open("table", ("class", "grid history-table"), ("id", "runs"));
        html.Open("thead").Open("tr");
        foreach (var header in Headers)
        {
            html.Element("th", header, ("scope", "col"));
        }

        html.Close("tr").Close("thead");
        html.Open("tbody");
        if (detail.Runs.Count == 0)
        {
            html.Open("tr").Open("td", ("colspan", Headers.Length.ToString(CultureInfo.InvariantCulture)), ("class", "empty"));
            html.Text("No runs recorded yet.");
            html.Close("td").Close("tr");
        }

        foreach (var run in detail.Runs)
        {
            Row(html, run);
        }

        html.Close("tbody");
        html.Close("table");
        html.Close("div");
        Pager(html, context, detail);
        html.Close("section");
    }

    private static void Row(Html html, RunRecord run)
    {
        var p = run.Profile;
        var failed = run.Status == RunStatus.Failed;
        var unmeasurable = run.Status == RunStatus.Unmeasurable;
        var interrupted = run.Status == RunStatus.Interrupted;
        html.Open("tr", ("data-run-id", run.Id.ToString(CultureInfo.InvariantCulture)), ("class", failed || unmeasurable || interrupted ? "run-failed" : null));
        html.Open("td", ("class", "when"));
        html.Element("time", Display.TimeWithSeconds(run.StartedAt), ("datetime", Display.Iso(run.StartedAt)));
        html.Element("span", "took " + Display.Duration(run.FinishedAt - run.StartedAt), ("class", "sub"));
        html.Close("td");
        html.Open("td");
        if (failed)
        {
            html.Element("span", "failed", ("class", "outcome outcome-failed"));
        }
        else if (unmeasurable)
        {
            html.Element("span", "unmeasurable", ("class", "outcome outcome-failed"));
        }
        else if (interrupted)
        {
            html.Element("span", "interrupted", ("class", "outcome outcome-failed"));
        }
        else if (run.WorstSeverity is { } worst)
        {
            Badges.Severity(html, worst);
        }
        else
        {
            html.Element("span", "clean", ("class", "outcome outcome-clean"));
        }

        html.Close("td");
        Num(html, Figures.Count(p?.NUsed));
        Num(html, Figures.Correlation(p?.PearsonR));
        Num(html, Figures.Correlation(p?.SpearmanRho));
        Num(html, Figures.Correlation(p?.KendallTauB));
        Num(html, Figures.Number(p?.Slope));
        Num(html, Figures.Number(p?.Intercept));
        Num(html, Figures.PValue(p?.QuadraticP));
        Num(html, Figures.Percent(p?.OutlierRate));
        Num(html, Figures.Percent(p is { NRows: > 0 } ? (double)p.NNull / p.NRows : null));
        html.Open("td", ("class", "run-findings"));
        if (failed || unmeasurable)
        {
            html.Element("span", run.Error ?? "failed without a message", ("class", "error-line"));
        }
        else if (run.Findings.Count == 0)
        {
            html.Element("span", "none", ("class", "muted"));
        }
        else
        {
            // One chip per kind (x and y can both shift), worst severity first; the messages are in the tooltip.
            foreach (var kind in run.Findings.GroupBy(f => f.Kind).OrderByDescending(g => g.Max(f => f.Severity)))
            {
                var worst = kind.Max(f => f.Severity);
                var label = Badges.Kind(kind.Key) + (kind.Count() > 1 ? " ×" + kind.Count().ToString(CultureInfo.InvariantCulture) : string.Empty);
                html.Element("span", label, ("class", "chip sev-chip-" + JsonContract.Name(worst)), ("title", string.Join("\n", kind.Select(f => f.Message))));
            }
        }

        html.Close("td");
        html.Close("tr");
    }

    private static void Num(Html html, string text) => html.Element("td", text, ("class", "num"));

    private static string RangeText(PairDetail detail)
    {
        if (detail.TotalRuns == 0)
        {
            return "no runs";
        }

        var first = (detail.Page - 1) * detail.PageSize + 1;
        var last = first + detail.Runs.Count - 1;
        var total = Figures.Count(detail.TotalRuns);
        return detail.Runs.Count == detail.TotalRuns
            ? $"all {total} runs, newest first"
            : $"runs {Figures.Count(first)}–{Figures.Count(last)} of {total}, newest first";
    }

    private static void Pager(Html html, PageContext context, PairDetail detail)
    {
        if (!context.Links.Paged || detail.PageCount <= 1)
        {
            return;
        }

        var name = detail.Summary.Name;
        html.Open("nav", ("class", "pager"), ("aria-label", "History pages"));
        if (detail.Page > 1)
        {
            html.Link(context.Links.Pair(name, detail.Page - 1) + "#history", "← newer", ("rel", "prev"));
        }

        html.Element("span", $"page {detail.Page.ToString(CultureInfo.InvariantCulture)} of {detail.PageCount.ToString(CultureInfo.InvariantCulture)}", ("class", "pager-pos"));
        if (detail.Page < detail.PageCount)
        {
            html.Link(context.Links.Pair(name, detail.Page + 1) + "#history", "older →", ("rel", "next"));
        }

        html.Close("nav");
    }
}
