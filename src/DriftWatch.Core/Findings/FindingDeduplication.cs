using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Findings;

/// <summary>
/// Drops a finding when a stronger one explains it, so one event raises one alert: a column that
/// became a copy also "gained correlation"; a sign flip is also a correlation shift; a unit change
/// moves the offset at the baseline's mean too; one new row of extreme leverage drags r, the slope
/// and the curvature with it.
/// </summary>
internal static class FindingDeduplication
{
    private static readonly (FindingKind Stronger, FindingKind[] Explains)[] Rules =
    [
        (FindingKind.PartlyDerived, [FindingKind.CorrelationShift, FindingKind.SlopeShift, FindingKind.OffsetShift, FindingKind.OutlierSurge, FindingKind.CurvatureAppeared]),
        (FindingKind.BecamePerfect, [FindingKind.PerfectRelationship, FindingKind.PartlyDerived, FindingKind.CorrelationShift, FindingKind.Curvature, FindingKind.CurvatureAppeared, FindingKind.SlopeShift, FindingKind.OffsetShift]),
        (FindingKind.RelationshipLost, [FindingKind.CorrelationShift, FindingKind.SlopeShift, FindingKind.OffsetShift]),
        (FindingKind.SlopeShift, [FindingKind.OffsetShift]),
        (FindingKind.CurvatureAppeared, [FindingKind.Curvature]),
        (FindingKind.OutlierSurge, [FindingKind.Outliers]),
        (FindingKind.LeverageAppeared, [FindingKind.SinglePointLeverage]),
    ];

    /// <summary>What a single dominant row can fake on its own.</summary>
    private static readonly FindingKind[] LeverageEchoes =
        [FindingKind.CorrelationShift, FindingKind.SlopeShift, FindingKind.OffsetShift, FindingKind.CurvatureAppeared, FindingKind.Curvature];

    public static IReadOnlyList<Finding> Merge(
        IReadOnlyList<Finding> own, IReadOnlyList<Finding> comparison, RelationshipProfile current, RelationshipProfile? baseline, Thresholds t)
    {
        var all = new List<Finding>(comparison);

        // A comparison sign flip (against the baseline) says more than the direction check of the profile.
        bool comparisonFlip = comparison.Any(f => f.Kind == FindingKind.SignFlip);
        all.AddRange(own.Where(f => !(comparisonFlip && f.Kind == FindingKind.SignFlip)));

        var kinds = all.Select(f => f.Kind).ToHashSet();
        if (kinds.Contains(FindingKind.SignFlip))
        {
            all.RemoveAll(f => f.Kind is FindingKind.CorrelationShift or FindingKind.SlopeShift or FindingKind.OffsetShift);
        }

        foreach (var (stronger, explains) in Rules)
        {
            if (kinds.Contains(stronger))
            {
                all.RemoveAll(f => explains.Contains(f.Kind));
            }
        }

        // A unit change keeps r; what r did is explained by it. Rows outside the sample that drive the exact
        // line explain the exact line's moves.
        if (all.Any(f => f.Kind == FindingKind.SlopeShift && f.Severity == Severity.Critical))
        {
            all.RemoveAll(f => f.Kind == FindingKind.CorrelationShift);
        }

        if (all.Any(f => f.Kind == FindingKind.HiddenRowsDriveLine && f.Severity >= Severity.Warning))
        {
            all.RemoveAll(f => f.Kind is FindingKind.CorrelationShift or FindingKind.SlopeShift or FindingKind.OffsetShift);
        }

        // When r without the new dominant row is back within MinCorrelationChange of the baseline's,
        // the row explains the shifts; the leverage finding names it and says what r would be.
        if (kinds.Contains(FindingKind.LeverageAppeared)
            && current.PearsonRWithoutTopInfluence is { } rWithout && baseline?.PearsonR is { } r0
            && Math.Abs(rWithout - r0) < t.MinCorrelationChange)
        {
            all.RemoveAll(f => LeverageEchoes.Contains(f.Kind));
        }

        // OrderByDescending is stable: within a severity, comparison findings first, in rule order.
        return [.. all.OrderByDescending(f => f.Severity)];
    }
}
