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

    public Severity? WorstSeverity => Findings.Count == 0 ? null : Findings.Max(f => f.Severity);
}
