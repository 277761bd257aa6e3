using DriftWatch.Core.Findings;

namespace DriftWatch.Core.Alerting;

/// <summary>
/// What one check of one pair contributes to alerting. <paramref name="ConsecutiveFailures"/> is the number of
/// failed or unmeasurable checks in a row ending with this one (0 when it succeeded); the monitor counts them from
/// the history. An unmeasurable check is not <paramref name="Succeeded"/>: it learnt nothing about the relationship.
/// </summary>
public sealed record PairOutcome(
    string Pair,
    long? RunId,
    bool Succeeded,
    IReadOnlyList<Finding> Findings,
    int ConsecutiveFailures = 0,
    string? Error = null)
{
    public static PairOutcome Success(string pair, long? runId, IReadOnlyList<Finding> findings) =>
        new(pair, runId, true, findings);

    public static PairOutcome Failure(string pair, long? runId, int consecutiveFailures, string error) =>
        new(pair, runId, false, [], consecutiveFailures, error);

    /// <summary>A check that ran but had nothing to measure (no rows, too few usable rows, a constant column).</summary>
    public static PairOutcome Unmeasurable(string pair, long? runId, int consecutiveFailures, string reason) =>
        new(pair, runId, false, [], consecutiveFailures, UnmeasurableLead + reason);

    /// <summary>How check_failing's message starts for an unmeasurable check, so mails tell it from a broken source.</summary>
    public const string UnmeasurableLead = "The check ran but could not measure the pair: ";
}
