using DriftWatch.Core.History;
using DriftWatch.Dashboard.Data;
using DriftWatch.Plots;

namespace DriftWatch.Dashboard.Pages;

/// <summary>The pair page's two pictures, rendered on the server as inline SVG by the shared plot renderers.</summary>
internal static class PairPlots
{
    /// <summary>The newest sample over the baseline's reservoir, both fitted lines, axes named after the columns.</summary>
    public static string Scatter(PairDetail detail)
    {
        ArgumentNullException.ThrowIfNull(detail);
        var summary = detail.Summary;
        var input = new ScatterPlotInput(
            summary.Config?.X ?? "x",
            summary.Config?.Y ?? "y",
            summary.Baseline?.Points,
            summary.Baseline?.Profile,
            detail.PlotRun?.Points,
            detail.PlotRun?.Profile);
        var svg = ScatterPlotRenderer.RenderSvg(input, 640, 440);
        return InlineSvg.Prepare(svg, "scatter-", $"Scatter plot of {input.YName} against {input.XName}: latest sample over the baseline sample");
    }

    /// <summary>Pearson r of every recent run, the baseline's r inside its 95% confidence band, severity markers on runs with findings.</summary>
    public static string Trend(PairDetail detail)
    {
        ArgumentNullException.ThrowIfNull(detail);
        var points = detail.Trend
            .Where(r => r.Status == RunStatus.Succeeded)
            .Select(r => new CorrelationHistoryPoint(r.StartedAt, r.Profile?.PearsonR, r.WorstSeverity))
            .ToArray();
        var baseline = detail.Summary.Baseline?.Profile is { PearsonR: { } r, PearsonCiLow: { } low, PearsonCiHigh: { } high }
            ? new CorrelationBaselineBand(r, low, high)
            : null;
        var svg = CorrelationHistoryChart.RenderSvg(points, baseline, null, 760, 360);
        return InlineSvg.Prepare(svg, "trend-", "Pearson r per run over time with the baseline's confidence band");
    }
}
