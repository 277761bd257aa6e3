using System.Globalization;
using DriftWatch.Tests.Dashboard;
using Microsoft.Playwright;

namespace DriftWatch.BrowserTests.Dashboard;

public sealed partial class DashboardBrowserTests
{
    [Fact]
    public async Task PairPage_ShowsFiveTrendCharts_EachWithACaption_AndTheScatterWithItsCaption()
    {
        var page = await _browser.NewPageAsync(new BrowserNewPageOptions { ViewportSize = new ViewportSize { Width = 1280, Height = 900 } });
        page.PageError += (_, message) => _scriptErrors.Add(message);
        await page.GotoAsync(_server.Address + "pairs/" + Uri.EscapeDataString(DashboardScenario.Perfect));

        var charts = page.Locator("#trend figure.trend-chart");
        Assert.Equal(5, await charts.CountAsync());
        string[] titles = ["Pearson r", "Slope", "Intercept", "Outlier rate", "Usable rows"];
        for (var i = 0; i < titles.Length; i++)
        {
            var chart = charts.Nth(i);
            var svg = chart.Locator("svg");
            Assert.True(await svg.IsVisibleAsync(), $"chart {titles[i]} is not visible");
            var box = await svg.BoundingBoxAsync();
            Assert.True(box!.Width > 250, $"chart {titles[i]} only {box.Width}px wide");
            Assert.Equal(1, await svg.Locator("text", new LocatorLocatorOptions { HasTextRegex = ExactText(titles[i]) }).CountAsync());
            var caption = await chart.Locator("figcaption").InnerTextAsync();
            // Every caption says what to look at and what the band is (the scenario has a baseline).
            Assert.Contains("normal range", caption, StringComparison.Ordinal);
            Assert.True(caption.Length > 80, $"caption of {titles[i]} too short: {caption}");
        }

        // r is a correlation: its axis never runs past ±1 (tick labels are written with U+2212).
        var ticks = (await charts.Nth(0).Locator("svg text").AllTextContentsAsync())
            .Select(t => t.Trim().Replace('\u2212', '-'))
            .Where(t => double.TryParse(t, NumberStyles.Float, CultureInfo.InvariantCulture, out _))
            .Select(t => double.Parse(t, CultureInfo.InvariantCulture))
            .ToArray();
        Assert.NotEmpty(ticks);
        Assert.All(ticks, t => Assert.InRange(t, -1, 1));

        var scatterCaption = await page.Locator("#scatter .plot-caption").InnerTextAsync();
        Assert.Contains("Look for", scatterCaption, StringComparison.Ordinal);
        await page.Locator("#trend").ScreenshotAsync(new LocatorScreenshotOptions { Path = Path.Combine(Screenshots, "dashboard-trends.png") });
        Assert.Empty(_scriptErrors);
    }
}
