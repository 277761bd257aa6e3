using DriftWatch.Core.Findings;

namespace DriftWatch.Core.Alerting;

/// <summary>
/// What one check of one pair contributes to alerting. <paramref name="ConsecutiveFailures"/> is the number of
/// failed checks in a row ending with this one (0 when it succeeded); the monitor counts them from the history.
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
}
