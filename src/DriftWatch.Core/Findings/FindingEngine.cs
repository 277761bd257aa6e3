using DriftWatch.Core.Baselines;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
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
        RelationshipProfile profile, PairDeclaration declared, Thresholds t, string xName = "x", string yName = "y")
    {
        ArgumentNullException.ThrowIfNull(profile);
        ArgumentNullException.ThrowIfNull(declared);
        ArgumentNullException.ThrowIfNull(t);
        return ProfileFindings.Of(profile, declared, t, ColumnNames.Of(xName, yName));
    }

    /// <summary>
    /// Comparison findings of the current profile against a baseline given by its pooled profile alone (one run:
    /// classic two-sample tests); the samples are the point sets the Kolmogorov–Smirnov tests use. Rules are
    /// independent here; see <see cref="Assess(RelationshipProfile, PairedSample, SourceFigures?, StoredBaseline?, PairDeclaration, Thresholds, string, string)"/>.
    /// </summary>
    public static IReadOnlyList<Finding> Compare(
        RelationshipProfile current,
        PairedSample currentSample,
        RelationshipProfile baseline,
        PairedSample baselineSample,
        PairDeclaration declared,
        Thresholds t,
        string xName = "x",
        string yName = "y")
    {
        ArgumentNullException.ThrowIfNull(current);
        ArgumentNullException.ThrowIfNull(currentSample);
        ArgumentNullException.ThrowIfNull(baseline);
        ArgumentNullException.ThrowIfNull(baselineSample);
        ArgumentNullException.ThrowIfNull(declared);
        ArgumentNullException.ThrowIfNull(t);
        var now = RunFigures.Of(0, default, current, null, t);
        return ComparisonFindings.Of(current, now, currentSample, BaselineView.Of(baseline, baselineSample, null, t, compareRowCounts: false), declared, t, ColumnNames.Of(xName, yName));
    }

    /// <summary>
    /// <see cref="Assess(RelationshipProfile, PairedSample, SourceFigures?, StoredBaseline?, PairDeclaration, Thresholds, string, string)"/>
    /// for a baseline known only by its pooled profile and points (two extracts compared by <c>profile</c>): the
    /// baseline stands as one run, with no spread between runs, and the extracts' lengths are not compared.
    /// </summary>
    public static IReadOnlyList<Finding> Assess(
        RelationshipProfile current,
        PairedSample currentSample,
        RelationshipProfile? baseline,
        PairedSample? baselineSample,
        PairDeclaration declared,
        Thresholds t,
        string xName = "x",
        string yName = "y")
    {
        ArgumentNullException.ThrowIfNull(t);
        var view = baseline is null ? null : BaselineView.Of(baseline, baselineSample ?? PairedSample.Empty, null, t, compareRowCounts: false);
        return Assess(current, currentSample, null, view, declared, t, xName, yName, default, []);
    }

    /// <summary>
    /// What the monitor calls: the profile's own findings, the exact figures against the sample's, and with a
    /// baseline the comparison with its runs' normal range; without findings another one already explains,
    /// ordered by severity (worst first).
    /// </summary>
    /// <param name="exact">The source's exact whole-window figures for this run, when it computed them.</param>
    /// <param name="at">When the run started (weekday-aware comparisons); default when unknown.</param>
    /// <param name="previous">The pair's previous run's findings: a change it raised is confirmed at a relaxed level (<see cref="Confirmation"/>).</param>
    public static IReadOnlyList<Finding> Assess(
        RelationshipProfile current,
        PairedSample currentSample,
        SourceFigures? exact,
        StoredBaseline? baseline,
        PairDeclaration declared,
        Thresholds t,
        string xName = "x",
        string yName = "y",
        DateTimeOffset at = default,
        IReadOnlyList<Finding>? previous = null)
    {
        ArgumentNullException.ThrowIfNull(t);
        var view = baseline is null ? null : BaselineView.Of(baseline.Profile, baseline.Points, baseline.Runs, t);
        return Assess(current, currentSample, exact, view, declared, t, xName, yName, at, previous ?? []);
    }

    private static IReadOnlyList<Finding> Assess(
        RelationshipProfile current,
        PairedSample currentSample,
        SourceFigures? exact,
        BaselineView? baseline,
        PairDeclaration declared,
        Thresholds t,
        string xName,
        string yName,
        DateTimeOffset at,
        IReadOnlyList<Finding> previous)
    {
        ArgumentNullException.ThrowIfNull(current);
        ArgumentNullException.ThrowIfNull(currentSample);
        ArgumentNullException.ThrowIfNull(declared);
        var names = ColumnNames.Of(xName, yName);
        bool baselineExact = baseline is not null && baseline.Mostly(r => r.IsExactFunction);
        var own = ProfileFindings.Of(current, declared, t, names, baselineExact);
        if (current.Shape != Shape.Undefined
            && HiddenRowsFinding.Of(current, exact, baseline is not null && baseline.Ever(r => r.LineDisagrees), t, names) is { } hidden)
        {
            own.Add(hidden);
        }

        var comparison = baseline is null
            ? []
            : ComparisonFindings.Of(current, RunFigures.Of(0, at, current, exact, t), currentSample, baseline, declared, t, names);
        if (baseline is not null && previous.Any(p => p.Severity >= Severity.Warning))
        {
            var relaxedThresholds = Confirmation.Relaxed(t);
            var relaxed = ComparisonFindings.Of(current, RunFigures.Of(0, at, current, exact, relaxedThresholds), currentSample, baseline, declared, relaxedThresholds, names, withMarginals: false);
            comparison.AddRange(Confirmation.Of(comparison, relaxed, previous));
        }

        return FindingDeduplication.Merge(own, comparison, current, baseline?.Pooled, t);
    }
}
