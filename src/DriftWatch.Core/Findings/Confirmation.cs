using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Findings;

/// <summary>
/// A warning must be seen in consecutive runs before it alerts, which protects against one-off chance findings
/// but lets a real, moderate change slip through when its second run lands just inside the limits. So a change
/// the previous run raised is confirmed at a relaxed level: ten times the test level and half the minimum
/// effect, on the same side. This is the control-chart practice of a warning limit inside the action limit
/// (two points in a row beyond the inner limit signal; the Western Electric rules, common practice): the first
/// sighting still needs the full evidence, so chance alone rarely starts the sequence.
/// </summary>
internal static class Confirmation
{
    /// <summary>The kinds a previous sighting lets a run confirm at the relaxed level: changes measured against the baseline.</summary>
    private static readonly HashSet<FindingKind> Confirmable =
    [
        FindingKind.CorrelationShift,
        FindingKind.SlopeShift,
        FindingKind.OffsetShift,
        FindingKind.CurvatureAppeared,
        FindingKind.OutlierSurge,
        FindingKind.NullSurge,
        FindingKind.SampleShrank,
    ];

    public const double AlphaFactor = 10;
    public const double EffectFactor = 0.5;

    public static Thresholds Relaxed(Thresholds t) => t with
    {
        Alpha = Math.Min(0.5, t.Alpha * AlphaFactor),
        MinCorrelationChange = t.MinCorrelationChange * EffectFactor,
        MinSlopeRatioChange = t.MinSlopeRatioChange * EffectFactor,
        MinOffsetShiftSds = t.MinOffsetShiftSds * EffectFactor,
        CurvatureMinR2Gain = t.CurvatureMinR2Gain * EffectFactor,
        MinOutlierRateIncrease = t.MinOutlierRateIncrease * EffectFactor,
        MinNullRateIncrease = t.MinNullRateIncrease * EffectFactor,
        SampleShrinkRatio = 1 - ((1 - t.SampleShrinkRatio) * EffectFactor),
    };

    /// <summary>
    /// The relaxed findings that confirm a previous one: a confirmable kind the previous run raised at warning or
    /// worse, missing from the full-level findings, moving to the same side.
    /// </summary>
    public static IEnumerable<Finding> Of(IReadOnlyList<Finding> full, IReadOnlyList<Finding> relaxed, IReadOnlyList<Finding> previous)
    {
        foreach (var finding in relaxed)
        {
            if (!Confirmable.Contains(finding.Kind) || full.Any(f => f.Kind == finding.Kind))
            {
                continue;
            }

            var before = previous.FirstOrDefault(p => p.Kind == finding.Kind && p.Severity >= Severity.Warning);
            if (before is null || Side(before) != Side(finding))
            {
                continue;
            }

            yield return finding with { Message = finding.Message + " This confirms the previous run's finding at the relaxed confirmation level." };
        }
    }

    /// <summary>Which way the change went: ratios against 1, differences against 0.</summary>
    private static int Side(Finding f) => f.Effect is not { } e ? 0 : f.Kind is FindingKind.SlopeShift or FindingKind.SampleShrank ? Math.Sign(e - 1) : Math.Sign(e);
}
