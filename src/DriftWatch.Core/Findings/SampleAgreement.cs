using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Findings;

/// <summary>
/// Does the sample's line agree with the exact whole-window line of the source's push-down aggregate? When the
/// window was sampled and the two disagree beyond sampling error, a few rows the sample missed drive the exact
/// line (a total row loaded among detail rows, a handful of extreme values).
/// </summary>
/// <param name="P">Bonferroni p of the two tests (slope and Fisher z of r), each with the finite-population correction.</param>
internal sealed record SampleAgreement(bool Disagrees, double P, double SampleSlope, double ExactSlope, double SampleR, double ExactR)
{
    /// <summary>Null when there is nothing to compare: no exact figures, or the sample is the whole window.</summary>
    public static SampleAgreement? Test(RelationshipProfile sample, SourceFigures? exact, Thresholds t)
    {
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(t);
        if (exact is not { Slope: { } be, PearsonR: { } re } || sample.NUsed >= exact.UsedCount || sample.NUsed <= 3
            || sample.Slope is not { } bs || sample.PearsonR is not { } rs || (sample.SlopeSeRobust ?? sample.SlopeSe) is not { } se || !(se > 0))
        {
            return null;
        }

        // Sampling without replacement from the window: the variance shrinks by 1 − n/N (common practice).
        double fpc = Math.Sqrt(1 - (sample.NUsed / (double)exact.UsedCount));
        double zSlope = (bs - be) / (se * fpc);
        double zR = (Correlation.FisherZ(rs) - Correlation.FisherZ(re)) * Math.Sqrt(sample.NUsed - 3) / fpc;
        double p = Math.Min(1, 2 * Math.Min(ZTest.TwoSidedP(zSlope), ZTest.TwoSidedP(zR)));
        bool material = (be != 0 && Math.Abs((bs / be) - 1) >= t.MinSlopeRatioChange) || Math.Abs(rs - re) >= t.MinCorrelationChange;
        return new SampleAgreement(material && p < t.Alpha, p, bs, be, rs, re);
    }

}
