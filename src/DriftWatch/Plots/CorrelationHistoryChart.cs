using System.Globalization;
using DriftWatch.Core.Findings;
using ScottPlot;

namespace DriftWatch.Plots;

/// <summary>
/// Pearson r per run over time for the dashboard: the baseline's r as a dashed line inside its confidence
/// band, the runs as a line, and a marker on every run with findings, shaped and coloured by severity.
/// </summary>
internal static class CorrelationHistoryChart
{
    public const int DefaultWidth = 760;
    public const int DefaultHeight = 300;

    public static string RenderSvg(IReadOnlyList<CorrelationHistoryPoint> points, CorrelationBaselineBand? baseline, string? title = null, int width = DefaultWidth, int height = DefaultHeight)
    {
        using var plot = Build(points, baseline, title, dashed: false);
        return plot.GetSvgXml(width, height);
    }

    public static byte[] RenderPng(IReadOnlyList<CorrelationHistoryPoint> points, CorrelationBaselineBand? baseline, string? title = null, int width = DefaultWidth, int height = DefaultHeight)
    {
        using var plot = Build(points, baseline, title, dashed: true);
        return plot.GetImageBytes(width, height, ImageFormat.Png);
    }

    private static Plot Build(IReadOnlyList<CorrelationHistoryPoint> points, CorrelationBaselineBand? baseline, string? title, bool dashed)
    {
        ArgumentNullException.ThrowIfNull(points);
        var plot = new Plot();
        plot.Font.Set(PlotPalette.FontName);
        var runs = points.Where(p => p.PearsonR is not null).OrderBy(p => p.At).ToArray();

        if (baseline is not null)
        {
            var band = plot.Add.VerticalSpan(baseline.Low, baseline.High, PlotPalette.Band);
            band.LegendText = string.Create(CultureInfo.InvariantCulture, $"baseline 95% CI [{baseline.Low:0.000}, {baseline.High:0.000}]");
            var line = plot.Add.HorizontalLine(baseline.R, 1.5f, PlotPalette.BaselineLine, dashed ? LinePattern.Dashed : LinePattern.Solid);
            line.LegendText = string.Create(CultureInfo.InvariantCulture, $"baseline r = {baseline.R:0.000}");
        }

        if (runs.Length > 0)
        {
            var xs = runs.Select(p => p.At.UtcDateTime.ToOADate()).ToArray();
            var ys = runs.Select(p => p.PearsonR!.Value).ToArray();
            var series = plot.Add.ScatterLine(xs, ys, PlotPalette.CurrentLine);
            series.LineWidth = 1.5f;
            series.MarkerSize = 3;
            series.LegendText = "Pearson r per run";
            AddMarkers(plot, runs, Severity.Warning, MarkerShape.FilledTriangleUp, PlotPalette.Warning, "warning finding");
            AddMarkers(plot, runs, Severity.Critical, MarkerShape.FilledDiamond, PlotPalette.Critical, "critical finding");
            AddMarkers(plot, runs, Severity.Info, MarkerShape.OpenCircle, PlotPalette.Info, "info finding");
            var axis = plot.Axes.DateTimeTicksBottom();
            if (axis.TickGenerator is ScottPlot.TickGenerators.DateTimeAutomatic ticks)
            {
                // ISO dates: the tool's readers are international; ScottPlot's default is month-first.
                ticks.LabelFormatter = TickLabel;
            }
        }
        else
        {
            plot.Add.Annotation("no runs with a defined r yet");
        }

        var low = Math.Min(runs.Select(p => p.PearsonR!.Value).DefaultIfEmpty(0).Min(), baseline?.Low ?? 1);
        var high = Math.Max(runs.Select(p => p.PearsonR!.Value).DefaultIfEmpty(0).Max(), baseline?.High ?? -1);
        var pad = Math.Max(0.05, (high - low) * 0.1);
        plot.Axes.SetLimitsY(Math.Max(-1.05, low - pad), Math.Min(1.05, high + pad));
        plot.YLabel("Pearson r", 13);
        if (!string.IsNullOrWhiteSpace(title))
        {
            plot.Title(title, 14);
        }

        plot.Legend.FontSize = 11;
        // Beside the chart, not over it: a run's marker must never hide behind the legend. An empty legend
        // panel makes ScottPlot 5.1 abandon the whole render (a blank image), hence the guard.
        if (runs.Length > 0 || baseline is not null)
        {
            plot.ShowLegend(Edge.Right);
        }
        return plot;
    }

    private static string TickLabel(DateTime at) =>
        at.TimeOfDay == TimeSpan.Zero
            ? at.ToString("yyyy-MM-dd", CultureInfo.InvariantCulture)
            : at.ToString("yyyy-MM-dd HH:mm", CultureInfo.InvariantCulture);

    private static void AddMarkers(Plot plot, CorrelationHistoryPoint[] runs, Severity severity, MarkerShape shape, Color color, string label)
    {
        var hits = runs.Where(p => p.WorstSeverity == severity).ToArray();
        if (hits.Length == 0)
        {
            return;
        }

        var markers = plot.Add.Markers(
            hits.Select(p => p.At.UtcDateTime.ToOADate()).ToArray(),
            hits.Select(p => p.PearsonR!.Value).ToArray(),
            shape,
            9,
            color);
        markers.LegendText = label;
    }
}
