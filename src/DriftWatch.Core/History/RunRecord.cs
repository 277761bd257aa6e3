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
    public Severity? WorstSeverity => Findings.Count == 0 ? null : Findings.Max(f => f.Severity);
}
