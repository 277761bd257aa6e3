using DriftWatch.Core.Baselines;
using DriftWatch.Core.History;
using DriftWatch.Core.Statistics;
using DriftWatch.Output;

namespace DriftWatch.Plots;

/// <summary>
/// The five small trend charts of a pair: Pearson r, slope, intercept, outlier rate and usable rows per run.
/// Each run's figures are <see cref="RunFigures.Of"/>, the figures the comparison uses (exact whole-window ones
/// where the source computed them); each band is <see cref="NormalRanges"/> over the baseline's runs at the
/// pair's alpha, the prediction range the comparison tests a run against.
/// </summary>
internal static class TrendChartsBuilder
{
    public static IReadOnlyList<TrendChartModel> Build(IReadOnlyList<RunRecord> runs, StoredBaseline? baseline, Thresholds thresholds, string yName = "y", string xName = "x")
    {
        ArgumentNullException.ThrowIfNull(runs);
        ArgumentNullException.ThrowIfNull(thresholds);
        var figures = runs
            .Where(r => r is { Status: RunStatus.Succeeded, Profile: not null })
            .OrderBy(r => r.StartedAt)
            .Select(r => (Run: r, Figures: RunFigures.Of(r.Id, r.StartedAt, r.Profile!, r.SourceFigures, thresholds)))
            .ToArray();
        var baseRuns = baseline?.Runs ?? [];
        double alpha = thresholds.Alpha;
        var level = Figures.Percent(1 - alpha);
        var bandText = baseRuns.Count == 0
            ? "No baseline runs yet, so no band."
            : $"Band: the baseline's normal range ({level} prediction range of its {Figures.Count(baseRuns.Count)} runs, as the comparison computes it); line: their mean.";

        TrendChartModel Chart(string id, string title, string label, Func<RunFigures, double?> value, NormalRange? band, string lookFor, double? floor = null, double? ceiling = null)
        {
            var points = figures
                .Where(f => value(f.Figures) is { } v && double.IsFinite(v))
                .Select(f => new TrendPoint(f.Run.StartedAt, value(f.Figures)!.Value, f.Run.WorstSeverity))
                .ToArray();
            return new TrendChartModel(id, title, label, points, band, Limits(points, band, floor, ceiling), $"{lookFor} {bandText}");
        }

        return
        [
            Chart("trend-r", "Pearson r", "r", f => f.R, NormalRanges.R(baseRuns, alpha),
                "How tightly the points follow a line. A unit or scale change leaves r flat: read it with the slope.", -1, 1),
            Chart("trend-slope", "Slope", $"{yName} per {xName}", f => f.Slope, NormalRanges.Slope(baseRuns, alpha),
                "A step with r unchanged is a unit or scale change (a factor such as 2.2 or 1000)."),
            Chart("trend-intercept", "Intercept", $"{yName} at {xName} = 0", f => f.Intercept, NormalRanges.Intercept(baseRuns, alpha),
                "A step with the slope unchanged is an added offset or a changed default."),
            Chart("trend-outliers", "Outlier rate", "share of rows", f => f.OutlierRate, NormalRanges.OutlierRate(baseRuns, alpha),
                "A rise means rows far off the line: placeholder values, entry or join errors.", 0, 1),
            Chart("trend-rows", "Usable rows", "rows", f => f.Used, NormalRanges.RowCount(baseRuns, alpha),
                "A drop points to a failed or partial load, a rise to duplicated rows.", 0),
        ];
    }

    /// <summary>
    /// Every run and the band fit (a trend is about the step, so no value is left off-scale); clamped to the
    /// figure's own range, so r never runs past ±1 and a rate never below 0.
    /// </summary>
    internal static AxisRange Limits(IReadOnlyList<TrendPoint> points, NormalRange? band, double? floor = null, double? ceiling = null)
    {
        var values = points.Select(p => p.Value)
            .Concat(band is null ? [] : [band.Low, band.High, band.Centre])
            .Where(double.IsFinite)
            .ToArray();
        if (values.Length == 0)
        {
            return new AxisRange(floor ?? 0, ceiling ?? 1);
        }

        var padded = RobustAxis.Pad(new AxisRange(values.Min(), values.Max()), 0.08);
        double min = floor is { } f ? Math.Max(f, padded.Min) : padded.Min;
        double max = ceiling is { } c ? Math.Min(c, padded.Max) : padded.Max;
        return max > min ? new AxisRange(min, max) : new AxisRange(floor ?? min - 1, ceiling ?? max + 1);
    }
}
