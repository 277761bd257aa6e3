using DriftWatch.Core.Baselines;
using MathNet.Numerics.Distributions;

namespace DriftWatch.Core.Tests.Baselines;

/// <summary>
/// The bands of the trend charts against the textbook prediction interval for one new observation,
/// mean ± t(k − 1, 1 − α/2) · s · √(1 + 1/k) (common practice; NIST/SEMATECH e-Handbook of Statistical Methods),
/// with MathNet.Numerics' Student t as the oracle for quantiles. The runs' own sampling errors are made negligible
/// so the interval is exactly the textbook one.
/// </summary>
public sealed class NormalRangesTests
{
    private static readonly double[] Values = [10, 12, 11, 13, 9];

    private static RunFigures Run(int i, double? r = null, double? slope = null, long used = 1_000_003) =>
        new(i, default, false, used, used, (int)Math.Min(used, int.MaxValue), r, null, slope, 0, 1, 0, 1, 0, 1, 0.01, 0, false);

    private static readonly double HalfWidth = StudentT.InvCDF(0, 1, 4, 0.975) * Math.Sqrt(2.5) * Math.Sqrt(1 + (1.0 / 5));

    [Fact]
    public void Slope_IsThePredictionIntervalOfTheRuns()
    {
        var runs = Values.Select((v, i) => Run(i, slope: v)).ToArray();

        var band = NormalRanges.Slope(runs, 0.05)!;

        // s² = 2.5 for these five values (hand computation).
        Assert.Equal(11, band.Centre, 12);
        Assert.Equal(11 - HalfWidth, band.Low, 9);
        Assert.Equal(11 + HalfWidth, band.High, 9);
    }

    [Fact]
    public void R_IsTheIntervalOnFisherZ_BackTransformed_AndStaysBelowOne()
    {
        // r values whose Fisher z are 1.0, 1.2, 1.1, 1.3, 0.9 (z = atanh r, Fisher 1915).
        var runs = Values.Select((v, i) => Run(i, r: Math.Tanh(v / 10))).ToArray();

        var band = NormalRanges.R(runs, 0.05)!;

        // On z the values are a tenth of the slope case, so the half-width is a tenth too (with negligible 1/(n − 3)).
        Assert.Equal(Math.Tanh(1.1 - (HalfWidth / 10)), band.Low, 5);
        Assert.Equal(Math.Tanh(1.1 + (HalfWidth / 10)), band.High, 5);
        Assert.True(band.High < 1);
    }

    [Fact]
    public void NoRuns_NoBand()
    {
        Assert.Null(NormalRanges.Slope([], 0.05));
        Assert.Null(NormalRanges.R([], 0.05));
    }
}
