using DriftWatch.Core.Findings;
using DriftWatch.Plots;

namespace DriftWatch.Tests.Plots;

public sealed class CorrelationHistoryChartTests
{
    private static readonly DateTimeOffset T0 = new(2026, 5, 4, 0, 0, 0, TimeSpan.Zero);

    [Fact]
    public void RenderSvg_ShowsTheBandTheLineAndOneLegendEntryPerSeverityPresent()
    {
        CorrelationHistoryPoint[] runs =
        [
            new(T0, 0.81, null),
            new(T0.AddDays(1), 0.83, null),
            new(T0.AddDays(2), 0.62, Severity.Warning),
            new(T0.AddDays(3), null, null),
            new(T0.AddDays(4), 1.0, Severity.Critical),
        ];

        var svg = CorrelationHistoryChart.RenderSvg(runs, new CorrelationBaselineBand(0.82, 0.78, 0.86), "weighed vs declared");

        var texts = SvgText.Of(svg);
        Assert.Contains("Pearson r", texts);
        Assert.Contains("Pearson r per run", texts);
        Assert.Contains("baseline 95% CI [0.780, 0.860]", texts);
        Assert.Contains("baseline r = 0.820", texts);
        Assert.Contains("warning finding", texts);
        Assert.Contains("critical finding", texts);
        Assert.DoesNotContain("info finding", texts);
        Assert.Contains("weighed vs declared", texts);
    }

    [Fact]
    public void RenderPng_DecodesWithTheRequestedSize_AndDrawsTheCriticalMarkerInRed()
    {
        CorrelationHistoryPoint[] runs = [new(T0, 0.8, null), new(T0.AddHours(6), 0.99, Severity.Critical)];

        var png = CorrelationHistoryChart.RenderPng(runs, null, null, 600, 240);

        Assert.Equal((600, 240), PngImage.AssertValid(png));
        Assert.True(PngImage.Count(png, c => c.Red > 150 && c.Green < 60 && c.Blue < 60) > 20, "no red critical marker");
    }

    [Fact]
    public void RenderSvg_NoRuns_StillRendersAWellFormedDocument()
    {
        var svg = CorrelationHistoryChart.RenderSvg([], null);

        Assert.Contains("no runs with a defined r yet", SvgText.Of(svg));
    }
}
