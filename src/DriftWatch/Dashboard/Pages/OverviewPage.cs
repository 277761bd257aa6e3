using System.Globalization;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Core.Statistics;
using DriftWatch.Dashboard.Data;
using DriftWatch.Output;

namespace DriftWatch.Dashboard.Pages;

/// <summary>What the overview is filtered by; every member optional. Read from the query string, applied on the server too.</summary>
internal sealed record OverviewFilter(string? Status = null, string? Source = null, string? Tag = null, string? Text = null)
{
    public static OverviewFilter None { get; } = new();

    public bool Matches(PairSummary row)
    {
        ArgumentNullException.ThrowIfNull(row);
        return (string.IsNullOrEmpty(Status) || Badges.StatusKey(row.Status) == Status)
            && (string.IsNullOrEmpty(Source) || row.Source == Source)
            && (string.IsNullOrEmpty(Tag) || row.Tags.Contains(Tag))
            && (string.IsNullOrWhiteSpace(Text) || OverviewPage.SearchText(row).Contains(Text.Trim().ToLowerInvariant(), StringComparison.Ordinal));
    }
}

/// <summary>
/// The overview: one row per pair, worst first, with the figures that say whether and how its relationship
/// moved. Sorting and filtering run in the page's script; without script the query string still filters.
/// </summary>
internal static class OverviewPage
{
    private static readonly (string Label, string Key, string Kind, string? Title)[] Columns =
    [
        ("Status", "status", "num", null),
        ("Pair", "pair", "text", null),
        ("Source", "source", "text", null),
        ("r", "r", "num", "Pearson r of the latest run"),
        ("ρ", "rho", "num", "Spearman ρ of the latest run"),
        ("Baseline r", "baseline-r", "num", "Pearson r of the baseline"),
        ("Δr", "delta-r", "num", "Latest r minus baseline r"),
        ("Slope ratio", "slope-ratio", "num", "Latest slope over the baseline's; 1 is unchanged"),
        ("Curvature p", "curvature-p", "num", "p-value of the quadratic term: small means the cloud bends"),
        ("Outliers", "outliers", "num", "Share of points with |studentized residual| above the pair's threshold"),
        ("n", "n", "num", "Usable rows in the latest sample"),
        ("Last run", "last-run", "num", null),
        ("Open alerts", "alerts", "num", "Open alerts of warning or worse (info in brackets)"),
    ];

    /// <param name="workers">The workers on the store (the served dashboard); null leaves the section out (the static report).</param>
    public static string Render(PageContext context, IReadOnlyList<PairSummary> rows, OverviewFilter filter, Health.WorkersHealth? workers = null)
    {
        ArgumentNullException.ThrowIfNull(context);
        ArgumentNullException.ThrowIfNull(rows);
        ArgumentNullException.ThrowIfNull(filter);
        return PageLayout.Render(context, "Pairs", PageLayout.NavOverview, html =>
        {
            html.Open("div", ("class", "page-head"));
            html.Element("h1", "Watched pairs");
            html.Element("p", "Worst first. Click a column to sort, a pair for its history.", ("class", "lede"));
            html.Close("div");
            Tally(html, context, rows);
            Filters(html, rows, filter);
            Table(html, context, rows, filter);
            if (workers is { Instances.Count: > 0 })
            {
                WorkersSection.Render(html, context, workers);
            }
        });
    }

    /// <summary>What the free-text filter searches: name, source, columns, tags, lower case.</summary>
    public static string SearchText(PairSummary row)
    {
        ArgumentNullException.ThrowIfNull(row);
        return string.Join(' ', new[] { row.Name, row.Source, row.Config?.X, row.Config?.Y, row.Config?.Table }.Concat(row.Tags).Where(s => s is not null))
            .ToLowerInvariant();
    }

    private static void Tally(Html html, PageContext context, IReadOnlyList<PairSummary> rows)
    {
        html.Open("section", ("class", "tally"), ("aria-label", "Pairs by status"));
        html.Open("a", ("class", "tile tile-all"), ("href", context.Links.Overview), ("data-status-filter", string.Empty));
        html.Element("span", Count(rows.Count), ("class", "tile-n"));
        html.Element("span", "pairs", ("class", "tile-label"));
        html.Close("a");
        foreach (var status in Enum.GetValues<PairStatus>())
        {
            var n = rows.Count(r => r.Status == status);
            if (n == 0 && status is PairStatus.NoRuns or PairStatus.NoBaseline)
            {
                // Always show the states that need people (and healthy); quiet ones only when present.
                continue;
            }

            var key = Badges.StatusKey(status);
            html.Open("a", ("class", $"tile st-{key}{(n == 0 ? " tile-zero" : string.Empty)}"), ("href", context.Links.OverviewWithStatus(key)), ("data-status-filter", key));
            html.Element("span", Count(n), ("class", "tile-n"));
            html.Open("span", ("class", "tile-label"));
            html.Element("span", Badges.Glyph(status), ("class", "glyph"), ("aria-hidden", "true"));
            html.Text(PairStatusRules.Label(status));
            html.Close("span");
            html.Close("a");
        }

        html.Close("section");
    }

    private static void Filters(Html html, IReadOnlyList<PairSummary> rows, OverviewFilter filter)
    {
        html.Open("form", ("class", "filters"), ("method", "get"), ("role", "search"), ("data-filter-for", "pairs"));
        Select(html, "status", "Status", Enum.GetValues<PairStatus>().Select(s => (Badges.StatusKey(s), PairStatusRules.Label(s))), filter.Status);
        Select(html, "source", "Source", rows.Select(r => r.Source).OfType<string>().Distinct().Order(StringComparer.Ordinal).Select(s => (s, s)), filter.Source);
        Select(html, "tag", "Tag", rows.SelectMany(r => r.Tags).Distinct().Order(StringComparer.Ordinal).Select(t => (t, t)), filter.Tag);
        html.Open("label", ("class", "field field-text"));
        html.Element("span", "Search");
        html.Open("input", ("type", "search"), ("name", "q"), ("value", filter.Text ?? string.Empty), ("placeholder", "pair, column, source or tag"), ("autocomplete", "off"));
        html.Close("label");
        html.Element("button", "Apply", ("type", "submit"), ("class", "apply"));
        var shown = rows.Count(filter.Matches);
        html.Element("output", $"{Count(shown)} of {Count(rows.Count)} shown", ("class", "shown"), ("aria-live", "polite"));
        html.Close("form");
    }

    private static void Select(Html html, string name, string label, IEnumerable<(string Value, string Text)> options, string? selected)
    {
        html.Open("label", ("class", "field"));
        html.Element("span", label);
        html.Open("select", ("name", name));
        html.Element("option", "all", ("value", string.Empty));
        foreach (var (value, text) in options)
        {
            html.Element("option", text, ("value", value), ("selected", value == selected ? string.Empty : null));
        }

        html.Close("select");
        html.Close("label");
    }

    private static void Table(Html html, PageContext context, IReadOnlyList<PairSummary> rows, OverviewFilter filter)
    {
        html.Open("div", ("class", "table-wrap"));
        html.Open("table", ("class", "grid sortable"), ("id", "pairs"));
        html.Open("thead").Open("tr");
        foreach (var (label, key, kind, title) in Columns)
        {
            html.Open("th", ("scope", "col"), ("data-key", key), ("data-kind", kind), ("title", title), ("aria-sort", key == "status" ? "ascending" : null));
            html.Element("button", label, ("type", "button"), ("class", "sort"));
            html.Close("th");
        }

        html.Close("tr").Close("thead");
        html.Open("tbody");
        if (rows.Count == 0)
        {
            html.Open("tr").Open("td", ("colspan", Columns.Length.ToString(CultureInfo.InvariantCulture)), ("class", "empty"));
            html.Text("No pairs are configured and the store has no history yet.");
            html.Close("td").Close("tr");
        }

        foreach (var row in rows)
        {
            Row(html, context, row, filter.Matches(row));
        }

        html.Close("tbody");
        html.Close("table");
        html.Close("div");
    }

    private static void Row(Html html, PageContext context, PairSummary row, bool visible)
    {
        var thresholds = row.Config?.Thresholds ?? Thresholds.Default;
        var current = row.Current;
        html.Open("tr",
            ("data-status", Badges.StatusKey(row.Status)),
            ("data-source", row.Source ?? string.Empty),
            ("data-tags", string.Join(' ', row.Tags)),
            ("data-text", SearchText(row)),
            ("hidden", visible ? null : string.Empty));

        Cell(html, ((int)row.Status).ToString(CultureInfo.InvariantCulture), h => Badges.Status(h, row.Status));
        Cell(html, row.Name, h =>
        {
            var link = context.Links.Pair(row.Name);
            if (link is null)
            {
                h.Open("span", ("class", "pair-name")).Name(row.Name).Close("span");
            }
            else
            {
                h.Open("a", ("href", link), ("class", "pair-name")).Name(row.Name).Close("a");
            }

            if (row.Config is { } config)
            {
                // x before y, as the command line and the configuration name them.
                h.Element("span", $"{config.X} vs {config.Y}", ("class", "sub"));
            }
            else
            {
                h.Element("span", "not in the configuration (history only)", ("class", "sub"));
            }

            if (row.Latest is { Status: RunStatus.Failed or RunStatus.Unmeasurable or RunStatus.Interrupted, Error: { } error })
            {
                h.Element("span", Shorten(error, 140), ("class", "sub error-line"), ("title", error));
            }
        });
        Cell(html, row.Source ?? string.Empty, h => h.Text(row.Source ?? Figures.Missing));
        Number(html, current?.PearsonR, Figures.Correlation(current?.PearsonR));
        Number(html, current?.SpearmanRho, Figures.Correlation(current?.SpearmanRho));
        Number(html, row.Baseline?.Profile.PearsonR, Figures.Correlation(row.Baseline?.Profile.PearsonR));
        Number(html, row.DeltaR, Figures.SignedCorrelation(row.DeltaR),
            row.DeltaR is { } d && Math.Abs(d) >= thresholds.MinCorrelationChange ? $"moved by at least the pair's {Figures.Number(thresholds.MinCorrelationChange)}" : null);
        Number(html, row.SlopeRatio, Figures.Number(row.SlopeRatio),
            row.SlopeRatio is { } s && Math.Abs(s - 1) >= thresholds.MinSlopeRatioChange ? $"differs from 1 by at least the pair's {Figures.Number(thresholds.MinSlopeRatioChange)}" : null);
        Number(html, current?.QuadraticP, Figures.PValue(current?.QuadraticP),
            current?.QuadraticP < thresholds.Alpha && current?.QuadraticR2Gain >= thresholds.CurvatureMinR2Gain ? "the cloud bends (significant quadratic term)" : null);
        Number(html, current?.OutlierRate, Figures.Percent(current?.OutlierRate),
            current?.OutlierRate > thresholds.MaxOutlierRate ? $"above the pair's {Figures.Percent(thresholds.MaxOutlierRate)}" : null);
        // An unmeasurable run still shows how many rows it could use (often 0): that is the news.
        var used = current?.NUsed ?? (row.Latest is { Status: RunStatus.Unmeasurable, Profile: { } counted } ? counted.NUsed : null);
        Number(html, used, Figures.Count(used));
        LastRun(html, context, row.Latest);
        OpenAlerts(html, row);
        html.Close("tr");
    }

    private static void LastRun(Html html, PageContext context, RunRecord? latest)
    {
        if (latest is null)
        {
            Cell(html, string.Empty, h => h.Text("never"));
            return;
        }

        Cell(html, Display.SortKey(latest.StartedAt.ToUnixTimeMilliseconds()), h =>
        {
            if (context.Live)
            {
                h.Element("time", Display.Relative(latest.StartedAt, context.Now), ("datetime", Display.Iso(latest.StartedAt)), ("title", Display.Time(latest.StartedAt)));
                h.Element("span", Display.Time(latest.StartedAt), ("class", "sub"));
            }
            else
            {
                h.Element("time", Display.Time(latest.StartedAt), ("datetime", Display.Iso(latest.StartedAt)));
            }
        });
    }

    private static void OpenAlerts(Html html, PairSummary row)
    {
        var serious = row.OpenAlerts.Where(a => a.Severity >= Core.Findings.Severity.Warning).ToArray();
        var info = row.OpenAlerts.Count - serious.Length;
        Cell(html, (serious.Length * 1000 + (int)(row.WorstOpenSeverity ?? 0) * 100 + info).ToString(CultureInfo.InvariantCulture), h =>
        {
            if (row.OpenAlerts.Count == 0)
            {
                h.Element("span", "none", ("class", "muted"));
                return;
            }

            h.Element("span", Count(serious.Length), ("class", "alert-count"));
            if (info > 0)
            {
                h.Element("span", $" (+{Count(info)} info)", ("class", "muted"));
            }

            foreach (var alert in serious)
            {
                h.Open("span", ("class", "sub kind-line"));
                Badges.Severity(h, alert.Severity);
                h.Text(" " + Badges.Kind(alert.Kind));
                h.Close("span");
            }
        });
    }

    private static void Cell(Html html, string sortKey, Action<Html> content)
    {
        html.Open("td", ("data-sort", sortKey));
        content(html);
        html.Close("td");
    }

    private static void Number(Html html, double? value, string text, string? flag = null)
    {
        html.Open("td", ("class", flag is null ? "num" : "num flag"), ("data-sort", Display.SortKey(value)), ("title", flag));
        html.Text(text);
        if (flag is not null)
        {
            html.Element("span", " !", ("class", "flag-mark"), ("aria-label", flag));
        }

        html.Close("td");
    }

    private static string Count(int n) => Figures.Count(n);

    private static string Shorten(string text, int max) => text.Length <= max ? text : text[..(max - 1)] + "…";
}
