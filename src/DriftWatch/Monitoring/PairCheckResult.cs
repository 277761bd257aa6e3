using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Monitoring;

/// <summary>What one check of one pair produced, as recorded in the store (RunId 0: the store write itself failed).</summary>
internal sealed record PairCheckResult(
    PairConfig Pair,
    long RunId,
    RunStatus Status,
    string? Error,
    RelationshipProfile? Profile,
    IReadOnlyList<Finding> Findings,
    DateTimeOffset StartedAt,
    DateTimeOffset FinishedAt,
    bool HasBaseline)
{
    /// <summary>The source's exact figures over the window, when it computed them.</summary>
    public SourceFigures? Window { get; init; }

    /// <summary>The baseline the run was judged against.</summary>
    public BaselineSummary? JudgedAgainst { get; init; }

    /// <summary>Where the run's window ended (see <see cref="NewRun.WindowEnd"/>).</summary>
    public DateTimeOffset? WindowEnd { get; init; }

    /// <summary>The run is back-dated (<c>check --as-of</c>): recorded at its as-of time, never alert evidence.</summary>
    public bool BackDated { get; init; }

    /// <summary>
    /// Set when the check found the same load an earlier run already read (anchor latest): nothing new was recorded,
    /// and this result is that run's (its id, status, figures and findings).
    /// </summary>
    public long? RepeatOf { get; init; }

    public Severity? WorstSeverity => Findings.Count == 0 ? null : Findings.Max(f => f.Severity);

    public TimeSpan Elapsed => FinishedAt - StartedAt;
}
