using DriftWatch.Core.Alerting;
using DriftWatch.Core.History;

namespace DriftWatch.Dashboard.Data;

/// <summary>
/// Everything the pair page shows. <see cref="Runs"/> is one page of the history, newest first;
/// <see cref="Trend"/> the recent runs for the r-over-time chart (newest first, without points);
/// <see cref="PlotRun"/> the newest successful run that still has its sampled points.
/// </summary>
internal sealed record PairDetail(
    PairSummary Summary,
    IReadOnlyList<RunRecord> Runs,
    int Page,
    int PageSize,
    int TotalRuns,
    IReadOnlyList<RunRecord> Trend,
    RunRecord? PlotRun,
    IReadOnlyList<AlertState> RecentAlerts)
{
    public int PageCount => Math.Max(1, (TotalRuns + PageSize - 1) / PageSize);
}
