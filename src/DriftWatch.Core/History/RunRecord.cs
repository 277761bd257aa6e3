using DriftWatch.Core.Findings;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Core.History;

/// <summary>A stored run. <see cref="Points"/> is null when not requested or already pruned.</summary>
public sealed record RunRecord(
    long Id,
    string Pair,
    DateTimeOffset StartedAt,
    DateTimeOffset FinishedAt,
    RunStatus Status,
    string? Error,
    RelationshipProfile? Profile,
    IReadOnlyList<Finding> Findings,
    SourceFigures? SourceFigures,
    PairedSample? Points,
    string? SampleMethod)
{
    /// <summary>The baseline the run was judged against; null without one, or for runs stored before it was recorded.</summary>
    public BaselineSummary? JudgedAgainst { get; init; }

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

    public Severity? WorstSeverity => Findings.Count == 0 ? null : Findings.Max(f => f.Severity);
}
