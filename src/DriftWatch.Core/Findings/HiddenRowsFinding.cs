using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Findings;

/// <summary>
/// The exact whole-window line disagrees with the sample's beyond sampling error (<see cref="SampleAgreement"/>):
/// a handful of rows outside the sample set the line every consumer of the full table sees. Critical when the
/// baseline's runs did not show it (such a row may be gone at the next load, so it alerts at once), info when
/// they did (a known property of the table).
/// </summary>
internal static class HiddenRowsFinding
{
    public static Finding? Of(RelationshipProfile sample, SourceFigures? exact, bool baselineHadIt, Thresholds t, ColumnNames c)
    {
        if (SampleAgreement.Test(sample, exact, t) is not { Disagrees: true } a)
        {
            return null;
        }

        return new Finding(
            FindingKind.HiddenRowsDriveLine,
            baselineHadIt ? Severity.Info : Severity.Critical,
            a.P,
            a.ExactSlope / a.SampleSlope,
            $"Over all {Numbers.Count(exact!.UsedCount)} rows of the window, r = {Numbers.Sig(a.ExactR)} and the slope of {c.Y} on {c.X} is {Numbers.Sig(a.ExactSlope, 4)}, but the {Numbers.Count(sample.NUsed)} sampled rows give r = {Numbers.Sig(a.SampleR)} and slope {Numbers.Sig(a.SampleSlope, 4)} ({Numbers.P(a.P)}): a few rows the sample missed drive the line, such as a total or test row loaded among detail rows.");
    }
}
