using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Statistics;

public sealed class CorrelationTests
{
    [Theory]
    [InlineData(0.6021, 11, 0.05)]
    [InlineData(0.7348, 11, 0.01)]
    [InlineData(0.4438, 20, 0.05)]
    [InlineData(0.2732, 52, 0.05)]
    public void PValue_TabulatedCriticalValuesOfR_GiveTheirLevel(double r, int n, double alpha)
    {
        // Critical values of Pearson's r, two-tailed, df = n − 2 (handbook table; from memory):
        // df 9: 0.6021 (5 %), 0.7348 (1 %); df 18: 0.4438 (5 %); df 50: 0.2732 (5 %).
        Assert.Equal(alpha, Correlation.PValue(r, n)!.Value, 3);
    }

    [Fact]
    public void FisherTwoSampleP_EqualCorrelations_IsOne()
    {
        Assert.Equal(1.0, Correlation.FisherTwoSampleP(0.5, 100, 0.5, 200)!.Value, 12);
    }

    [Fact]
    public void FisherTwoSampleP_TextbookExample_MatchesHandComputation()
    {
        // Fisher (1921): z = atanh r; r1 = 0.6 (n 50) against r2 = 0.3 (n 60):
        // z1 − z2 = 0.6931 − 0.3095 = 0.3836, SE = √(1/47 + 1/57) = 0.1970, Z = 1.947, two-sided p ≈ 0.0515
        // (common practice, computed by hand from the normal table).
        Assert.Equal(0.0515, Correlation.FisherTwoSampleP(0.6, 50, 0.3, 60)!.Value, 0.0003);
    }

    [Fact]
    public void ProportionIncreaseP_TextbookExample_MatchesHandComputation()
    {
        // Pooled two-proportion z test: 30/200 against 15/200: pooled 0.1125, SE = 0.03159, Z = 2.374,
        // one-sided p ≈ 0.0088 (common practice, normal table).
        Assert.Equal(0.0088, ZTest.ProportionIncreaseP(30, 200, 15, 200), 0.0003);
    }
}
