namespace DriftWatch.Core.Baselines;

/// <summary>What to do about a pair's baseline at one check.</summary>
public enum BaselinePlanKind
{
    /// <summary>The stored baseline stands (or there is none and nothing to build it from yet).</summary>
    KeepExisting,

    /// <summary>Load the successful runs the plan names and pool them.</summary>
    Build,
}

/// <summary>
/// Which runs to pool: successful runs started in [<paramref name="From"/>, <paramref name="To"/>)
/// (null = open end), oldest first, at most <paramref name="Limit"/>.
/// </summary>
/// <param name="RequiredRuns">Build only when at least this many runs qualify (first_runs); otherwise keep what is stored.</param>
/// <param name="ExcludeCritical">Skip runs that had a critical finding, so a fault does not become the new normal.</param>
/// <param name="Accepted">The rebuilt baseline keeps the accepted mark (a rolling baseline anchored at an accepted run).</param>
/// <param name="Reason">Why, in a few words, for logs.</param>
public sealed record BaselinePlan(
    BaselinePlanKind Kind,
    DateTimeOffset? From,
    DateTimeOffset? To,
    int? Limit,
    int RequiredRuns,
    bool ExcludeCritical,
    bool Accepted,
    string Reason)
{
    public static BaselinePlan Keep(string reason) => new(BaselinePlanKind.KeepExisting, null, null, null, 0, false, false, reason);
}
