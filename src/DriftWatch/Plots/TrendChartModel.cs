using DriftWatch.Core.Baselines;
using DriftWatch.Core.Findings;

namespace DriftWatch.Plots;

/// <summary>
/// One small trend chart: a figure per run over time, the baseline's normal range as a band with its centre,
/// markers on runs with findings, the y range to draw and the caption that says what to look at.
/// </summary>
internal sealed record TrendChartModel(
    string Id,
    string Title,
    string YLabel,
    IReadOnlyList<TrendPoint> Points,
    NormalRange? Band,
    AxisRange Y,
    string Caption);

/// <summary>One run on a trend chart; <paramref name="Worst"/> null means the run had no findings.</summary>
internal sealed record TrendPoint(DateTimeOffset At, double Value, Severity? Worst);
