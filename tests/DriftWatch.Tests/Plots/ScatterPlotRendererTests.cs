using DriftWatch.Plots;

namespace DriftWatch.Tests.Plots;

public sealed class ScatterPlotRendererTests
{
    private static ScatterPlotModel Input(string x = "declared_kg", string y = "weighed_kg") =>
        Model(new(x, y, AnscombeData.Set1, AnscombeData.Fit, AnscombeData.Set3, AnscombeData.Fit, "parcel weights"));

    private static ScatterPlotModel Model(ScatterPlotInput input) => ScatterPlotModelBuilder.Build(input, Core.Statistics.Thresholds.Default);

    [Fact]
    public void RenderSvg_NamesBothAxesAfterTheColumns_AndLabelsTheLegend()
    {
        var svg = ScatterPlotRenderer.RenderSvg(Input());

        var texts = SvgText.Of(svg);
        Assert.Contains("declared_kg", texts);
        Assert.Contains("weighed_kg", texts);
        Assert.Contains("parcel weights", texts);
        // Legend entries: both samples with their sizes, both fitted lines with Anscombe's published fit.
        Assert.Contains("baseline points (n = 11)", texts);
        Assert.Contains("current points (n = 11)", texts);
        Assert.Contains("baseline fit: y = 3 + 0.5·x", texts);
        Assert.Contains("current fit: y = 3 + 0.5·x", texts);
    }

    [Fact]
    public void RenderSvg_DrawsEveryPointOfBothSeries()
    {
        var svg = ScatterPlotRenderer.RenderSvg(Input());

        // ScottPlot's SVG canvas writes each circle marker as an <ellipse>: 11 baseline points, 10 current ones (set
        // III's point at x = 13 is its outlier, drawn as a cross), one legend symbol per series.
        var ellipses = System.Text.RegularExpressions.Regex.Count(svg, "<ellipse ");
        Assert.Equal(11 + 10 + 2, ellipses);
        Assert.Contains("current outlying points (1)", SvgText.Of(svg));
    }

    [Fact]
    public void RenderSvg_HostileColumnName_IsEscaped()
    {
        var svg = ScatterPlotRenderer.RenderSvg(Input(x: "<script>alert(1)</script>"));

        Assert.DoesNotContain("<script>", svg, StringComparison.OrdinalIgnoreCase);
        Assert.Contains("<script>alert(1)</script>", SvgText.Of(svg));
    }

    [Fact]
    public void RenderPng_DecodesWithTheRequestedSize_AndShowsGreyAndColouredPoints()
    {
        var png = ScatterPlotRenderer.RenderPng(Input(), 500, 320);

        var (width, height) = PngImage.AssertValid(png);
        Assert.Equal((500, 320), (width, height));
        // The current series is teal (blue well above red), the baseline grey (channels equal, mid-tone).
        Assert.True(PngImage.Count(png, c => c.Blue - c.Red > 60 && c.Green - c.Red > 40) > 50, "no coloured current points");
        Assert.True(PngImage.Count(png, c => Math.Abs(c.Red - c.Blue) < 8 && c.Red is > 150 and < 215) > 50, "no grey baseline points");
    }

    [Fact]
    public void RenderPng_WithoutAnyPoints_StillRendersAxesAndANote()
    {
        var input = Model(new ScatterPlotInput("first_col", "second_col", null, null, null, null));

        var png = ScatterPlotRenderer.RenderPng(input);
        var svg = ScatterPlotRenderer.RenderSvg(input);

        Assert.Equal((ScatterPlotRenderer.DefaultWidth, ScatterPlotRenderer.DefaultHeight), PngImage.AssertValid(png));
        // A blank image would pass the size check; the texts prove the render ran to the end.
        Assert.Contains("no sampled points to show", SvgText.Of(svg));
        Assert.Contains("first_col", SvgText.Of(svg));
    }

    [Fact]
    public void RenderPng_UnmeasurableRunWithAConstantX_RendersItsPointsWithoutALine()
    {
        // What an unmeasurable run keeps (a check_failing mail may plot it): Anscombe (1973) set 4's ten rows with
        // x = 8, a constant column whose profile has no slope.
        var points = new Core.Profiling.PairedSample([.. Enumerable.Repeat(8.0, 10)], [6.58, 5.76, 7.71, 8.84, 8.47, 7.04, 5.25, 5.56, 7.91, 6.89]);
        var profile = Core.Profiling.Profiler.Profile(points, Core.Statistics.Thresholds.Default);
        Assert.Null(profile.Slope);
        var input = Model(new ScatterPlotInput("axle_count", "toll_eur", null, null, points, profile));

        var png = ScatterPlotRenderer.RenderPng(input, 500, 320);

        Assert.Equal((500, 320), PngImage.AssertValid(png));
        Assert.True(PngImage.Count(png, c => c.Blue - c.Red > 60 && c.Green - c.Red > 40) > 10, "no coloured current points");
    }
}
