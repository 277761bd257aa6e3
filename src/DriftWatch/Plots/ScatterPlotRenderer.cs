using DriftWatch.Output;
using ScottPlot;

namespace DriftWatch.Plots;

/// <summary>
/// Draws a <see cref="ScatterPlotModel"/>: baseline points as grey open circles, current points as teal dots,
/// outlying points as crosses, off-scale points as triangles at the edge with their values written beside them,
/// the fits with their equations in the legend. PNG for email (mail clients do not show inline SVG), SVG for the
/// dashboard; both from the same model, so the axes and markers agree.
/// </summary>
internal static class ScatterPlotRenderer
{
    public const int DefaultWidth = 640;
    public const int DefaultHeight = 460;

    public static byte[] RenderPng(ScatterPlotModel model, int width = DefaultWidth, int height = DefaultHeight)
    {
        using var plot = Build(model, dashed: true);
        return plot.GetImageBytes(width, height, ImageFormat.Png);
    }

    /// <summary>An SVG document; every text (column names included) is XML-escaped by the SVG canvas.</summary>
    public static string RenderSvg(ScatterPlotModel model, int width = DefaultWidth, int height = DefaultHeight)
    {
        // Skia's SVG backend cannot draw dash effects (it logs one warning per segment): solid lines there;
        // the baseline line stays apart by its muted colour and thinner stroke.
        using var plot = Build(model, dashed: false);
        return plot.GetSvgXml(width, height);
    }

    private static Plot Build(ScatterPlotModel model, bool dashed)
    {
        ArgumentNullException.ThrowIfNull(model);
        var plot = new Plot();
        plot.Font.Set(PlotPalette.FontName);
        foreach (var series in model.Series)
        {
            AddSeries(plot, series, dashed);
        }

        AddOffScale(plot, model);
        plot.XLabel(model.XName, 13);
        plot.YLabel(model.YName, 13);
        if (!string.IsNullOrWhiteSpace(model.Title))
        {
            plot.Title(model.Title, 14);
        }

        plot.Legend.FontSize = 11;
        if (model.IsEmpty)
        {
            // No legend then: an empty legend panel makes ScottPlot 5.1 abandon the render (a blank image).
            plot.Add.Annotation("no sampled points to show");
            return plot;
        }

        plot.Axes.SetLimits(model.X.Min, model.X.Max, model.Y.Min, model.Y.Max);
        // Below the plot, not over it: points in any corner stay visible.
        plot.ShowLegend(Edge.Bottom);
        // Side by side and wrapped: a stacked legend of six entries would be cut off below a 460-pixel picture.
        plot.Legend.Orientation = Orientation.Horizontal;
        return plot;
    }

    private static void AddSeries(Plot plot, ScatterSeries series, bool dashed)
    {
        var baseline = series.Name == "baseline";
        var pointColor = baseline ? PlotPalette.BaselinePoints : PlotPalette.CurrentPoints;
        var lineColor = baseline ? PlotPalette.BaselineLine : PlotPalette.CurrentLine;
        if (series.Ordinary.Count > 0)
        {
            var points = plot.Add.Markers(
                series.Ordinary.Select(p => p.X).ToArray(),
                series.Ordinary.Select(p => p.Y).ToArray(),
                baseline ? MarkerShape.OpenCircle : MarkerShape.FilledCircle,
                5,
                pointColor);
            points.LegendText = $"{series.Name} points (n = {Figures.Count(series.Count)})";
        }

        if (series.Outlying.Count > 0)
        {
            var outlying = plot.Add.Markers(
                series.Outlying.Select(p => p.X).ToArray(),
                series.Outlying.Select(p => p.Y).ToArray(),
                MarkerShape.Eks,
                9,
                baseline ? PlotPalette.BaselineLine : PlotPalette.Critical);
            outlying.MarkerLineWidth = 2;
            outlying.LegendText = $"{series.Name} outlying points ({Figures.Count(series.Outlying.Count)})";
        }

        if (series.Fit is { } fit)
        {
            var line = plot.Add.ScatterLine(fit.Points.Select(p => p.X).ToArray(), fit.Points.Select(p => p.Y).ToArray(), lineColor);
            line.LineWidth = baseline ? 1.5f : 2.5f;
            line.LinePattern = baseline && dashed ? LinePattern.Dashed : LinePattern.Solid;
            line.MarkerSize = 0;
            line.LegendText = $"{series.Name} {(fit.Quadratic ? "parabola" : "fit")}: {fit.Equation}";
        }
    }

    private static void AddOffScale(Plot plot, ScatterPlotModel model)
    {
        Add(plot, model, OffScaleSide.Above, MarkerShape.FilledTriangleUp, "off-scale above (value labelled)");
        Add(plot, model, OffScaleSide.Below, MarkerShape.FilledTriangleDown, "off-scale below (value labelled)");
        Add(plot, model, OffScaleSide.Left | OffScaleSide.Right, MarkerShape.FilledDiamond, "off-scale in x (value labelled)");

        foreach (var label in model.Labels)
        {
            var text = plot.Add.Text(label.Text, label.At.X, label.At.Y);
            text.LabelFontSize = 10;
            text.LabelFontColor = PlotPalette.Critical;
            text.LabelBackgroundColor = Colors.White.WithOpacity(0.8);
            text.LabelAlignment = Align(label, model);
            text.LabelOffsetY = label.Side.HasFlag(OffScaleSide.Above) ? 7 : label.Side.HasFlag(OffScaleSide.Below) ? -7 : 0;
            text.LabelOffsetX = label.Side.HasFlag(OffScaleSide.Right) ? -8 : label.Side.HasFlag(OffScaleSide.Left) ? 8 : 0;
        }
    }

    private static void Add(Plot plot, ScatterPlotModel model, OffScaleSide sides, MarkerShape shape, string legend)
    {
        // Vertical sides decide the shape first: a point above and right is drawn as "above".
        var vertical = (sides & (OffScaleSide.Above | OffScaleSide.Below)) != 0;
        var points = model.OffScale
            .Where(p => vertical ? (p.Side & sides) != 0 : (p.Side & (OffScaleSide.Above | OffScaleSide.Below)) == 0)
            .ToArray();
        if (points.Length == 0)
        {
            return;
        }

        var markers = plot.Add.Markers(points.Select(p => p.Drawn.X).ToArray(), points.Select(p => p.Drawn.Y).ToArray(), shape, 9, PlotPalette.Critical);
        markers.LegendText = legend;
    }

    /// <summary>Text kept inside the plot: towards the centre from its edge, and from the nearer side in x.</summary>
    private static Alignment Align(OffScaleLabel label, ScatterPlotModel model)
    {
        var rightHalf = label.At.X > model.X.Min + (model.X.Span / 2);
        if (label.Side.HasFlag(OffScaleSide.Above))
        {
            return rightHalf ? Alignment.UpperRight : Alignment.UpperLeft;
        }

        if (label.Side.HasFlag(OffScaleSide.Below))
        {
            return rightHalf ? Alignment.LowerRight : Alignment.LowerLeft;
        }

        return label.Side.HasFlag(OffScaleSide.Right) ? Alignment.MiddleRight : Alignment.MiddleLeft;
    }
}
