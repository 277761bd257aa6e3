using DriftWatch.Core.Findings;

namespace DriftWatch.Demo;

/// <summary>
/// A fault the scenario injects into one pair from <paramref name="Day"/> on (it stays, as upstream bugs do),
/// and what DriftWatch should say about it: <paramref name="Expected"/>, on that day or within
/// <paramref name="AllowedLag"/> days after it.
/// </summary>
internal sealed record ScenarioFault(
    string Pair,
    int Day,
    string Description,
    FindingKind Expected,
    int AllowedLag = ScenarioFault.DefaultAllowedLag)
{
    /// <summary>
    /// Two days: a warning needs two runs in a row before it is confirmed (alerting.warning_confirm_runs), and
    /// check_failing is confirmed on the third failed check (alerting.check_failing_after).
    /// </summary>
    public const int DefaultAllowedLag = 2;

    /// <summary>The last day on which a detection still counts as "caught".</summary>
    public int Deadline => Day + AllowedLag;
}
