using System.Globalization;
using DriftWatch.Core.Findings;
using DriftWatch.Output;
using ScottPlot;

namespace DriftWatch.Plots;

/// <summary>
/// Draws a <see cref="TrendChartModel"/> small: the band and its centre line behind, the runs as a line with
/// dots, runs with findings marked by shape (triangle warning, diamond critical, open circle info). No legend
/// inside a small chart: the page states the key once for all five.
/// </summary>
internal static class TrendChartRenderer
{
    public const int DefaultWidth = 420;
    public const int DefaultHeight = 230;

    public static string RenderSvg(TrendChartModel model, int width = DefaultWidth, int height = DefaultHeight)
    {
        using var plot = Build(model, dashed: false);
        return plot.GetSvgXml(width, height);
    }

    public static byte[] RenderPng(TrendChartModel model, int width = DefaultWidth, int height = DefaultHeight)
    {
        using var plot = Build(model, dashed: true);
        return plot.GetImageBytes(width, height, ImageFormat.Png);
    }

    private static Plot Build(TrendChartModel model, bool dashed)
    {
        ArgumentNullException.ThrowIfNull(model);
        var plot = new Plot();
        plot.Font.Set(PlotPalette.FontName);
        if (model.Band is { } band)
        {
            plot.Add.VerticalSpan(band.Low, band.High, PlotPalette.Band);
            plot.Add.HorizontalLine(band.Centre, 1.2f, PlotPalette.BaselineLine, dashed ? LinePattern.Dashed : LinePattern.Solid);
        }

        var points = model.Points;
        if (points.Count > 0)
        {
            var xs = points.Select(p => p.At.UtcDateTime.ToOADate()).ToArray();
            var series = plot.Add.ScatterLine(xs, points.Select(p => p.Value).ToArray(), PlotPalette.CurrentLine);
            series.LineWidth = 1.5f;
            series.MarkerSize = 3;
            Markers(plot, points, Severity.Warning, MarkerShape.FilledTriangleUp, PlotPalette.Warning);
            Markers(plot, points, Severity.Critical, MarkerShape.FilledDiamond, PlotPalette.Critical);
            Markers(plot, points, Severity.Info, MarkerShape.OpenCircle, PlotPalette.Info);
            var axis = plot.Axes.DateTimeTicksBottom();
            if (axis.TickGenerator is ScottPlot.TickGenerators.DateTimeAutomatic ticks)
            {
                // ISO dates: the tool's readers are international; ScottPlot's default is month-first.
                ticks.LabelFormatter = TickLabel;
            }

            if (points.Count == 1)
            {
                var at = xs[0];
                plot.Axes.SetLimitsX(at - 1, at + 1);
            }
        }
        else
        {
            plot.Add.Annotation("no runs with this figure yet");
        }

        plot.Axes.SetLimitsY(model.Y.Min, model.Y.Max);
        if (plot.Axes.Left.TickGenerator is ScottPlot.TickGenerators.NumericAutomatic numeric)
        {
            numeric.LabelFormatter = v => Figures.Coefficient(v);
        }

        plot.Title(model.Title, 13);
        plot.YLabel(model.YLabel, 11);
        return plot;
    }

    private static string TickLabel(DateTime at) =>
        at.TimeOfDay == TimeSpan.Zero
            ? at.ToString("MM-dd", CultureInfo.InvariantCulture)
            : at.ToString("MM-dd HH:mm", CultureInfo.InvariantCulture);

    private static void Markers(Plot plot, IReadOnlyList<TrendPoint> points, Severity severity, MarkerShape shape, Color color)
    {
        var hits = points.Where(p => p.Worst == severity).ToArray();
        if (hits.Length > 0)
        {
            plot.Add.Markers(hits.Select(p => p.At.UtcDateTime.ToOADate()).ToArray(), hits.Select(p => p.Value).ToArray(), shape, 8, color);
        }
    }
}
