using DriftWatch.Core.Statistics;
using MathNet.Numerics.Distributions;

namespace DriftWatch.Core.Tests.Statistics;

/// <summary>
/// The run-spread test against the textbook prediction interval for one new observation,
/// mean ± t(k − 1, 1 − α/2) · s · √(1 + 1/k) (common practice; e.g. the NIST/SEMATECH e-Handbook of
/// Statistical Methods on prediction intervals), with MathNet.Numerics' Student t as the oracle for quantiles.
/// </summary>
public sealed class RunSpreadTests
{
    private static readonly double[] Values = [10, 12, 11, 13, 9];

    [Fact]
    public void HalfWidth_RunsWithoutSamplingError_IsThePredictionInterval()
    {
        var spread = RunSpread.Of(Values.Select(v => (v, 0.0)), currentVariance: 0)!.Value;

        // s² = 2.5 for these five values (hand computation: squared deviations 1, 1, 0, 4, 4 over 4).
        double s = Math.Sqrt(2.5);
        double expected = StudentT.InvCDF(0, 1, 4, 0.975) * s * Math.Sqrt(1 + (1.0 / 5));
        Assert.Equal(11, spread.Centre, 12);
        Assert.Equal(expected, spread.HalfWidth(0.05), 10);

        // t(4, 0.975) = 2.776 in the handbook tables of Student's t (from memory): the half-width is about 4.81.
        Assert.Equal(4.81, spread.HalfWidth(0.05), 2);
    }

    [Fact]
    public void TwoSidedP_AtTheIntervalEdge_IsAlpha()
    {
        var spread = RunSpread.Of(Values.Select(v => (v, 0.0)), currentVariance: 0)!.Value;

        double edge = spread.Centre + spread.HalfWidth(0.01);

        Assert.Equal(0.01, spread.TwoSidedP(edge), 8);
        Assert.Equal(0.005, spread.IncreaseP(edge), 8);
        Assert.True(spread.DecreaseP(edge) > 0.99);
    }

    [Fact]
    public void Of_OneRun_IsTheClassicTwoSampleZTest()
    {
        var spread = RunSpread.Of([(5.0, 0.04)], currentVariance: 0.05)!.Value;

        // z = (5.6 − 5) / √(0.04 + 0.05) = 2.0; two-sided normal p = 0.0455 (standard normal table; common practice).
        Assert.Equal(0.09, spread.Variance, 12);
        Assert.Equal(2 * Normal.CDF(0, 1, -2.0), spread.TwoSidedP(5.6), 12);
        Assert.Equal(0.0455, spread.TwoSidedP(5.6), 4);
    }

    [Fact]
    public void Of_RunsThatAgreeByChance_NeverClaimMorePrecisionThanTheirSamplingError()
    {
        // Five identical values: their spread (0) is below the sampling variance each run had (0.25).
        var spread = RunSpread.Of(Enumerable.Repeat((3.0, 0.25), 5), currentVariance: 0.25)!.Value;

        // Floor: s² ≥ the runs' mean sampling variance, so the variance is 0.25 · (1 + 1/5).
        Assert.Equal(0.25 * 1.2, spread.Variance, 12);
    }

    [Fact]
    public void Of_ACurrentRunNoisierThanTheBaselineRuns_WidensByTheDifference()
    {
        var quiet = RunSpread.Of(Values.Select(v => (v, 0.1)), currentVariance: 0.1)!.Value;
        var noisy = RunSpread.Of(Values.Select(v => (v, 0.1)), currentVariance: 1.1)!.Value;

        Assert.Equal(quiet.Variance + 1.0, noisy.Variance, 12);
    }

    [Fact]
    public void Of_NoUsableRun_IsNull()
    {
        Assert.Null(RunSpread.Of([], 1));
        Assert.Null(RunSpread.Of([(double.NaN, 1.0)], 1));
    }
}
