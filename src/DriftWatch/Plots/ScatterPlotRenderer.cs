using DriftWatch.Core.Profiling;
using ScottPlot;

namespace DriftWatch.Plots;

/// <summary>
/// Baseline points muted grey, current points in colour, both fitted lines, axes named after the columns,
/// and a legend. PNG for email (mail clients do not show inline SVG), SVG for the dashboard.
/// </summary>
internal static class ScatterPlotRenderer
{
    public const int DefaultWidth = 640;
    public const int DefaultHeight = 420;
    public const int MaxPointsPerSeries = 2000;

    public static byte[] RenderPng(ScatterPlotInput input, int width = DefaultWidth, int height = DefaultHeight)
    {
        using var plot = Build(input, dashed: true);
        return plot.GetImageBytes(width, height, ImageFormat.Png);
    }

    /// <summary>An SVG document; every text (column names included) is XML-escaped by the SVG canvas.</summary>
    public static string RenderSvg(ScatterPlotInput input, int width = DefaultWidth, int height = DefaultHeight)
    {
        // Skia's SVG backend cannot draw dash effects (it logs one warning per segment): solid lines there;
        // the baseline line stays apart by its muted colour.
        using var plot = Build(input, dashed: false);
        return plot.GetSvgXml(width, height);
    }

    private static Plot Build(ScatterPlotInput input, bool dashed)
    {
        ArgumentNullException.ThrowIfNull(input);
        var plot = new Plot();
        plot.Font.Set(PlotPalette.FontName);
        AddSeries(plot, "baseline", input.BaselinePoints, input.BaselineProfile, PlotPalette.BaselinePoints, PlotPalette.BaselineLine, dashed ? LinePattern.Dashed : LinePattern.Solid);
        AddSeries(plot, "current", input.CurrentPoints, input.CurrentProfile, PlotPalette.CurrentPoints, PlotPalette.CurrentLine, LinePattern.Solid);

        plot.XLabel(input.XName, 13);
        plot.YLabel(input.YName, 13);
        if (!string.IsNullOrWhiteSpace(input.Title))
        {
            plot.Title(input.Title, 14);
        }

        plot.Legend.FontSize = 11;
        if (input.BaselinePoints is not { UsedCount: > 0 } && input.CurrentPoints is not { UsedCount: > 0 })
        {
            // No legend then: an empty legend panel makes ScottPlot 5.1 abandon the render (a blank image).
            plot.Add.Annotation("no sampled points to show");
        }
        else
        {
            // Below the plot, not over it: points in any corner stay visible.
            plot.ShowLegend(Edge.Bottom);
        }
        return plot;
    }

    private static void AddSeries(Plot plot, string name, PairedSample? points, RelationshipProfile? profile, Color pointColor, Color lineColor, LinePattern pattern)
    {
        if (points is not { UsedCount: > 0 })
        {
            return;
        }

        var (xs, ys) = PlotFormat.Thin(points.X, points.Y, MaxPointsPerSeries);
        var scatter = plot.Add.ScatterPoints(xs, ys, pointColor);
        scatter.MarkerSize = 5;
        scatter.MarkerShape = MarkerShape.FilledCircle;
        scatter.LegendText = $"{name} points (n = {PlotFormat.Count(points.UsedCount)})";

        if (profile is { Slope: { } slope, Intercept: { } intercept })
        {
            var min = points.X.Min();
            var max = points.X.Max();
            var line = plot.Add.Line(min, intercept + slope * min, max, intercept + slope * max);
            line.LineColor = lineColor;
            line.LineWidth = 2;
            line.LinePattern = pattern;
            line.MarkerSize = 0;
            line.LegendText = $"{name} fit: y = {PlotFormat.Number(intercept)} + {PlotFormat.Number(slope)}·x";
        }
    }
}
