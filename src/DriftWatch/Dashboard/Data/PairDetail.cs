using DriftWatch.Core.Alerting;
using DriftWatch.Core.History;

namespace DriftWatch.Dashboard.Data;

/// <summary>
/// Everything the pair page shows. <see cref="Runs"/> is one page of the history, newest first;
/// <see cref="Trend"/> the recent runs for the trend charts (newest first, without points);
/// <see cref="PlotRun"/> the newest successful run that still has its sampled points;
/// <see cref="BaselineRunsNeeded"/> how many more measurable runs a first_runs policy needs before its baseline exists
/// (null with a baseline or another policy).
/// </summary>
internal sealed record PairDetail(
    PairSummary Summary,
    IReadOnlyList<RunRecord> Runs,
    int Page,
    int PageSize,
    int TotalRuns,
    IReadOnlyList<RunRecord> Trend,
    RunRecord? PlotRun,
    IReadOnlyList<AlertState> RecentAlerts,
    int? BaselineRunsNeeded = null)
{
    public int PageCount => Math.Max(1, (TotalRuns + PageSize - 1) / PageSize);
}
