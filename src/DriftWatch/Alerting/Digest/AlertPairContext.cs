using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Alerting.Digest;

/// <summary>
/// Everything a digest says about one pair, filled by the monitor from the run it just made and the stored
/// baseline: the composer never queries anything itself. Points may be null (failed run, no baseline yet,
/// pruned); the message then shows what it has.
/// </summary>
internal sealed record AlertPairContext(
    PairConfig Pair,
    RelationshipProfile? Current,
    PairedSample? CurrentPoints,
    RelationshipProfile? Baseline,
    PairedSample? BaselinePoints)
{
    /// <summary>The source's exact figures over the run's window, when it computed them.</summary>
    public SourceFigures? Window { get; init; }

    /// <summary>The baseline the run was judged against, as recorded with the run (not one rebuilt later).</summary>
    public BaselineSummary? JudgedAgainst { get; init; }

    /// <summary>For a notification whose pair is no longer configured: names only, no figures.</summary>
    public static AlertPairContext Unknown(string pair) =>
        new(new PairConfig { Name = pair, Source = "(not configured)", X = "x", Y = "y" }, null, null, null, null);
}
