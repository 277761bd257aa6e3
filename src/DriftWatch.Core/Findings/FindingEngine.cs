using DriftWatch.Core.Configuration;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Findings;

/// <summary>Turns profiles into findings: statistical signals for a person to look at, not proof.</summary>
public static class FindingEngine
{
    /// <summary>
    /// Findings of a profile on its own: perfect_relationship, curvature, outliers,
    /// single_point_leverage; exactness_lost when the pair is declared exact and is not; sign_flip when
    /// r has the sign opposite to the declared direction.
    /// </summary>
    public static IReadOnlyList<Finding> ForProfile(
        RelationshipProfile profile, PairExpectation expect, Thresholds t, string xName = "x", string yName = "y")
    {
        ArgumentNullException.ThrowIfNull(profile);
        ArgumentNullException.ThrowIfNull(expect);
        ArgumentNullException.ThrowIfNull(t);
        return ProfileFindings.Of(profile, expect, t, ColumnNames.Of(xName, yName));
    }

    /// <summary>
    /// Comparison findings of the current profile against the baseline; the samples are the point
    /// sets the Kolmogorov–Smirnov tests use. Rules are independent here; see <see cref="Assess"/>.
    /// </summary>
    public static IReadOnlyList<Finding> Compare(
        RelationshipProfile current,
        PairedSample currentSample,
        RelationshipProfile baseline,
        PairedSample baselineSample,
        PairExpectation expect,
        Thresholds t,
        string xName = "x",
        string yName = "y")
    {
        ArgumentNullException.ThrowIfNull(current);
        ArgumentNullException.ThrowIfNull(currentSample);
        ArgumentNullException.ThrowIfNull(baseline);
        ArgumentNullException.ThrowIfNull(baselineSample);
        ArgumentNullException.ThrowIfNull(expect);
        ArgumentNullException.ThrowIfNull(t);
        return ComparisonFindings.Of(current, currentSample, baseline, baselineSample, expect, t, ColumnNames.Of(xName, yName));
    }

    /// <summary>
    /// What the monitor calls: the profile's own findings plus, with a baseline, the comparison,
    /// without findings another one already explains, ordered by severity (worst first).
    /// Without a baseline sample the marginal (Kolmogorov–Smirnov) tests are skipped.
    /// </summary>
    public static IReadOnlyList<Finding> Assess(
        RelationshipProfile current,
        PairedSample currentSample,
        RelationshipProfile? baseline,
        PairedSample? baselineSample,
        PairExpectation expect,
        Thresholds t,
        string xName = "x",
        string yName = "y")
    {
        ArgumentNullException.ThrowIfNull(current);
        ArgumentNullException.ThrowIfNull(currentSample);
        ArgumentNullException.ThrowIfNull(expect);
        ArgumentNullException.ThrowIfNull(t);
        var names = ColumnNames.Of(xName, yName);
        var own = ProfileFindings.Of(current, expect, t, names);
        var comparison = baseline is null
            ? []
            : ComparisonFindings.Of(current, currentSample, baseline, baselineSample ?? PairedSample.Empty, expect, t, names);
        return FindingDeduplication.Merge(own, comparison, current, baseline, t);
    }
}
