using System.Globalization;
using System.Net;
using System.Text.RegularExpressions;
using DriftWatch.Core.History;
using DriftWatch.Output;
using MathNet.Numerics.Statistics;

namespace DriftWatch.Tests.Dashboard.Pages;

/// <summary>The served pages over the scenario store: what they show, how they escape, what they link.</summary>
[Collection(DashboardScenarioGroup.Name)]
public sealed class PagesEndpointTests(DashboardFixture fixture)
{
    private DashboardHost Host => fixture.Host;

    private DashboardScenario Scenario => fixture.Scenario;

    [Fact]
    public async Task Overview_OneRowPerPair_WorstFirst_WithStatusFromRunsAlertsAndBaselines()
    {
        var (status, html) = await Host.GetAsync("/");

        Assert.Equal(200, status);
        var rows = PageHtml.OverviewRows(html);
        // Worst first by the most severe open alert, then its state, then the latest findings: the two confirmed
        // criticals (became_perfect with a critical finding in its latest run, then check_failing whose latest run
        // failed) rank above the confirmed perfect_relationship warning, although the failing pair's status word differs.
        Assert.Equal(
            [
                ("confirmed", DashboardScenario.Perfect),
                ("failing", DashboardScenario.Failing),
                ("confirmed", DashboardScenario.Hostile),
                ("no_baseline", DashboardScenario.Young),
                ("healthy", DashboardScenario.Healthy),
            ],
            rows.Select(r => (r.Status, r.Pair)));
        // The tally counts the same.
        Assert.Matches("st-confirmed\"[^>]*><span class=\"tile-n\">2<", html);
        Assert.Matches("st-failing\"[^>]*><span class=\"tile-n\">1<", html);
        Assert.Matches("st-healthy\"[^>]*><span class=\"tile-n\">1<", html);
        Assert.Contains(Cautions.SignalsNotProof, html, StringComparison.Ordinal);
        // The failing pair says why.
        Assert.Contains(DashboardScenario.SourceError, html, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Overview_Figures_AgreeWithMathNetOnTheStoredPoints()
    {
        var latest = (await Scenario.History.GetRunsAsync(DashboardScenario.Healthy, 1, includePoints: true, CancellationToken.None))[0];
        var baseline = (await Scenario.History.GetBaselineAsync(DashboardScenario.Healthy, CancellationToken.None))!;
        // Independent oracle: MathNet.Numerics' Pearson and Spearman over the very points the run stored
        // (300 per run, below the store's 1000-point cap, so the whole sample), and over the baseline reservoir.
        var r = Correlation.Pearson(latest.Points!.X, latest.Points.Y);
        var rho = Correlation.Spearman(latest.Points.X, latest.Points.Y);
        var r0 = Correlation.Pearson(baseline.Points.X, baseline.Points.Y);

        var (_, html) = await Host.GetAsync("/");
        var cells = PageHtml.Cells(PageHtml.OverviewRows(html).Single(row => row.Pair == DashboardScenario.Healthy).Markup);

        // Columns: status, pair, source, r, ρ, baseline r, Δr, slope ratio, curvature p, outliers, n, last run, alerts.
        Assert.Equal("shop_db", cells[2]);
        Assert.Equal(r.ToString("0.000", CultureInfo.InvariantCulture), cells[3]);
        Assert.Equal(rho.ToString("0.000", CultureInfo.InvariantCulture), cells[4]);
        Assert.Equal(r0.ToString("0.000", CultureInfo.InvariantCulture), cells[5]);
        Assert.Equal((r - r0).ToString("+0.000;-0.000;0.000", CultureInfo.InvariantCulture), cells[6]);
        Assert.Equal("300", cells[10]);
        Assert.Contains("20 min ago", cells[11], StringComparison.Ordinal);
        Assert.Contains("2026-11-30 18:00 UTC", cells[11], StringComparison.Ordinal);
        Assert.Equal("none", cells[12]);
    }

    [Fact]
    public async Task Overview_FilterInTheQuery_HidesTheOtherRowsOnTheServer()
    {
        var (_, html) = await Host.GetAsync("/?status=failing");

        var rows = PageHtml.OverviewRows(html);
        Assert.Equal([DashboardScenario.Failing], rows.Where(r => !r.Markup.Contains(" hidden>", StringComparison.Ordinal)).Select(r => r.Pair));
        Assert.Contains("1 of 5 shown", html, StringComparison.Ordinal);

        var (_, byTag) = await Host.GetAsync("/?tag=finance");
        Assert.Equal([DashboardScenario.Perfect], PageHtml.OverviewRows(byTag).Where(r => !r.Markup.Contains(" hidden>", StringComparison.Ordinal)).Select(r => r.Pair));
    }

    [Theory]
    [InlineData("/")]
    [InlineData("/alerts")]
    [InlineData("/pairs/%3Cscript%3Ealert(1)%3C%2Fscript%3E")]
    public async Task Pages_HostilePairColumnAndTagNames_AreEscaped(string path)
    {
        var (status, html) = await Host.GetAsync(path);

        Assert.Equal(200, status);
        Assert.DoesNotContain("<script>alert", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("<img src=x", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("<b>tag", html, StringComparison.OrdinalIgnoreCase);
        Assert.Contains("&lt;script&gt;alert(1)&lt;/script&gt;", html, StringComparison.Ordinal);
    }

    [Fact]
    public async Task PairPage_HostileName_IsReachableThroughTheOverviewLink_AndItsPlotAxisIsEscapedText()
    {
        var (_, overview) = await Host.GetAsync("/");
        var href = PageHtml.Href(PageHtml.OverviewRows(overview).Single(r => r.Pair == DashboardScenario.Hostile).Markup);

        var (status, html) = await Host.GetAsync(href);

        Assert.Equal(200, status);
        // Escaped, with a place to wrap after the '/' (Html.Name): still text, never markup.
        Assert.Contains("<span class=\"pair-title\">&lt;script&gt;alert(1)&lt;/<wbr>script&gt;</span>", html, StringComparison.Ordinal);
        // Inside the inline SVG the column name is XML-escaped text of an axis label, not markup.
        Assert.Contains("&lt;img src=x onerror=alert(2)&gt;</text>", html, StringComparison.Ordinal);
    }

    [Fact]
    public async Task PairPage_ShowsFindingsPlotsBaselineConfigAndEveryRun()
    {
        var (status, html) = await Host.GetAsync("/pairs/" + DashboardScenario.Perfect);

        Assert.Equal(200, status);
        Assert.Contains("became perfect", html, StringComparison.Ordinal);
        Assert.Contains("gross_amount became an exact function of net_amount", html, StringComparison.Ordinal);

        // Server-rendered SVG plots with their axis labels and legends: the scatter and five trend charts.
        Assert.Equal(1 + 5, PageHtml.Count(html, "<svg "));
        Assert.Matches(">net_amount</text>", html);
        Assert.Matches(">gross_amount</text>", html);
        Assert.Matches(">Pearson r</text>", html);
        Assert.Matches(">baseline points \\(n = 1,500\\)</text>", html);
        Assert.Matches(">current points \\(n = 300\\)</text>", html);
        // Ids are prefixed per plot, so no two plots share a clip path.
        var ids = Regex.Matches(html, " id=\"((?:scatter|trend)-[^\"]+)\"").Select(m => m.Groups[1].Value).ToArray();
        Assert.NotEmpty(ids);
        Assert.Equal(ids.Length, ids.Distinct().Count());

        Assert.Contains("first_runs: 5", html, StringComparison.Ordinal);
        Assert.Contains("billing.invoices", html, StringComparison.Ordinal);
        Assert.Contains("0 0 */6 * * ?", html, StringComparison.Ordinal);
        Assert.Contains("all defaults", html, StringComparison.Ordinal);

        Assert.Equal(DashboardScenario.Cycles, PageHtml.Count(html, "<tr data-run-id="));
        Assert.Contains("all 16 runs, newest first", html, StringComparison.Ordinal);
        // Newest first: the last four runs carry the finding, the first twelve none.
        var rows = Regex.Matches(html, "<tr data-run-id=.*?</tr>", RegexOptions.Singleline).Select(m => m.Value).ToArray();
        Assert.All(rows[..4], row => Assert.Contains(">became perfect</span>", row, StringComparison.Ordinal));
        Assert.All(rows[4..], row => Assert.DoesNotContain("became perfect", row, StringComparison.Ordinal));
        Assert.Contains("2026-11-30 18:00:03 UTC", rows[0], StringComparison.Ordinal);
    }

    [Fact]
    public async Task PairPage_FailingPair_ShowsTheErrorAndTheFailedRuns()
    {
        var (_, html) = await Host.GetAsync("/pairs/" + DashboardScenario.Failing);

        Assert.Contains("The latest check failed: </strong>", html, StringComparison.Ordinal);
        Assert.Equal(3, PageHtml.Count(html, "class=\"run-failed\""));
        Assert.Contains("check failing", html, StringComparison.Ordinal);
    }

    [Fact]
    public async Task PairPage_UnknownPair_Is404()
    {
        var (status, html) = await Host.GetAsync("/pairs/no.such.pair");

        Assert.Equal(404, status);
        Assert.Contains("No pair named &#x27;no.such.pair&#x27;", html, StringComparison.Ordinal);
    }

    [Fact]
    public async Task AlertsPage_ListsLifecycleTimesAndDeliveryStates()
    {
        var (status, html) = await Host.GetAsync("/alerts");

        Assert.Equal(200, status);
        var open = Regex.Match(html, "<table class=\"grid\" id=\"open-alerts\">.*?</table>", RegexOptions.Singleline).Value;
        Assert.Contains(">became perfect</td>", open, StringComparison.Ordinal);
        Assert.Contains(">check failing</td>", open, StringComparison.Ordinal);
        // check_failing was confirmed at the third failed check (alerting.check_failing_after = 3): the last cycle, plus a minute.
        Assert.Contains("<time datetime=\"2026-11-30T18:01:00Z\"", open, StringComparison.Ordinal);

        Assert.Equal(Scenario.OutboxCount - 1, PageHtml.Count(html, "data-delivery=\"sent\""));
        Assert.Equal(1, PageHtml.Count(html, "data-delivery=\"retrying\""));
        Assert.Contains("451 4.7.0 temporary failure", html, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("/")]
    [InlineData("/pairs/invoices.gross_vs_net")]
    [InlineData("/alerts")]
    public async Task Pages_NeedNothingTheirContentSecurityPolicyForbids(string path)
    {
        using var response = await Host.Client.GetAsync(new Uri(path, UriKind.Relative));
        var html = await response.Content.ReadAsStringAsync();

        var policy = response.Headers.GetValues("Content-Security-Policy").Single();
        Assert.Contains("script-src 'self'", policy, StringComparison.Ordinal);
        Assert.Contains("style-src 'self'", policy, StringComparison.Ordinal);
        Assert.Equal("nosniff", response.Headers.GetValues("X-Content-Type-Options").Single());
        // No inline script or style, no style attribute, nothing from another origin.
        Assert.Equal(PageHtml.Count(html, "<script"), PageHtml.Count(html, "<script src=\"/assets/"));
        Assert.DoesNotContain("<style", html, StringComparison.Ordinal);
        Assert.DoesNotContain(" style=", html, StringComparison.Ordinal);
        Assert.DoesNotMatch("(src|href)=\"(https?:)?//", html);
    }

    [Fact]
    public async Task Assets_AreServedFromTheAssembly_WithRevalidation()
    {
        using var css = await Host.Client.GetAsync(new Uri("/assets/dashboard.css", UriKind.Relative));
        Assert.Equal("text/css; charset=utf-8", css.Content.Headers.ContentType!.ToString());
        Assert.Contains(".badge", await css.Content.ReadAsStringAsync(), StringComparison.Ordinal);

        using var request = new HttpRequestMessage(HttpMethod.Get, "/assets/dashboard.js");
        request.Headers.IfNoneMatch.Add(css.Headers.ETag!);
        using var again = await Host.Client.SendAsync(request);
        Assert.Equal(HttpStatusCode.NotModified, again.StatusCode);
    }
}
