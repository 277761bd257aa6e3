using DriftWatch.Core.Statistics;
using DriftWatch.Dashboard.Data;
using DriftWatch.Plots;

namespace DriftWatch.Dashboard.Pages;

/// <summary>The pair page's pictures, built by the shared plot models and rendered on the server as inline SVG.</summary>
internal static class PairPlots
{
    public const int ScatterWidth = 640;
    public const int ScatterHeight = 480;

    private static Thresholds Thresholds(PairDetail detail) => detail.Summary.Config?.Thresholds ?? Core.Statistics.Thresholds.Default;

    /// <summary>The newest sample over the baseline's reservoir, as the alert mail shows it.</summary>
    public static ScatterPlotModel ScatterModel(PairDetail detail)
    {
        ArgumentNullException.ThrowIfNull(detail);
        var summary = detail.Summary;
        return ScatterPlotModelBuilder.Build(
            new ScatterPlotInput(
                summary.Config?.X ?? "x",
                summary.Config?.Y ?? "y",
                summary.Baseline?.Points,
                summary.Baseline?.Profile,
                detail.PlotRun?.Points,
                detail.PlotRun?.Profile),
            Thresholds(detail));
    }

    public static string Scatter(ScatterPlotModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        var svg = ScatterPlotRenderer.RenderSvg(model, ScatterWidth, ScatterHeight);
        return InlineSvg.Prepare(svg, "scatter-", $"Scatter plot of {model.YName} against {model.XName}: latest sample over the baseline sample");
    }

    /// <summary>r, slope, intercept, outlier rate and usable rows per recent run, each with the baseline's normal range.</summary>
    public static IReadOnlyList<TrendChartModel> TrendModels(PairDetail detail)
    {
        ArgumentNullException.ThrowIfNull(detail);
        var config = detail.Summary.Config;
        return TrendChartsBuilder.Build(detail.Trend, detail.Summary.Baseline, Thresholds(detail), config?.Y ?? "y", config?.X ?? "x");
    }

    public static string Trend(TrendChartModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        var svg = TrendChartRenderer.RenderSvg(model);
        return InlineSvg.Prepare(svg, model.Id + "-", $"{model.Title} per run over time with the baseline's normal range", "plot trend-plot");
    }
}
