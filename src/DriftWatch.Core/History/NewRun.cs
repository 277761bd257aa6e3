using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Core.History;

/// <summary>What one check of one pair produced; written to the store in one transaction.</summary>
public sealed record NewRun(
    string Pair,
    DateTimeOffset StartedAt,
    DateTimeOffset FinishedAt,
    RunStatus Status,
    string? Error,
    RelationshipProfile? Profile,
    IReadOnlyList<Finding> Findings,
    SourceFigures? SourceFigures,
    PairedSample? Points,
    string? SampleMethod = null)
{
    /// <summary>The baseline the run was judged against; null without one (or for a failed run).</summary>
    public BaselineSummary? JudgedAgainst { get; init; }

    /// <summary>
    /// Names this run across processes (a GUID chosen when the check starts): the store writes a run with a given
    /// key at most once, so a run written again after a crash (from the worker's spool) is not duplicated. Null for
    /// runs that are written once and only once (one-shot commands).
    /// </summary>
    public string? RunKey { get; init; }

    /// <summary>
    /// Where the run's window ended: the check time (anchor <c>now</c>) or the newest value of the window column
    /// (anchor <c>latest</c>); null without a window, when latest found no value, or for runs stored before it was recorded.
    /// </summary>
    public DateTimeOffset? WindowEnd { get; init; }

    /// <summary>
    /// For a back-dated run (<c>check --as-of</c>): when it was actually made; its <c>StartedAt</c> is the as-of time.
    /// Such runs are history and baseline material, never alert evidence. Null for runs made at their own time.
    /// </summary>
    public DateTimeOffset? BackDatedAt { get; init; }

    /// <summary>The schedule slot (the trigger's scheduled time, UTC) the check ran for; null for checks not started by the schedule.</summary>
    public DateTimeOffset? SlotAt { get; init; }
}
