using DriftWatch.Core.Baselines;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Core.History;

/// <summary>
/// The reference a pair is compared with: a profile of pooled points plus a bounded reservoir of those
/// points (for plots and the Kolmogorov–Smirnov test). The profile's figures describe the pooled points; its
/// row counts are the pooled runs' means (see <c>BaselineBuilder</c>), so they compare with one run's.
/// </summary>
/// <param name="MeanRunUsed">
/// Mean usable rows per pooled run (from the runs' own profiles). The pooled profile's counts describe the
/// pool, which can be several runs' worth of points; compare a run's sample size with this instead.
/// </param>
public sealed record StoredBaseline(
    string Pair,
    BaselinePolicyKind Policy,
    string PolicyText,
    DateTimeOffset CreatedAt,
    DateTimeOffset CoversFrom,
    DateTimeOffset CoversTo,
    int RunCount,
    RelationshipProfile Profile,
    PairedSample Points,
    bool Accepted = false,
    double? MeanRunUsed = null)
{
    /// <summary>
    /// The pooled runs' own figures, oldest first: what comparisons test a run against (their centre and the
    /// spread between them). Empty for a baseline stored before runs were kept; it is then rebuilt.
    /// </summary>
    public IReadOnlyList<RunFigures> Runs { get; init; } = [];
}
