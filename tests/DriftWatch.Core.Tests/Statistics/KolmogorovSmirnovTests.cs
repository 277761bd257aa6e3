using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Statistics;

public sealed class KolmogorovSmirnovTests
{
    [Theory]
    [InlineData(1.3581, 0.05)]
    [InlineData(1.6276, 0.01)]
    [InlineData(1.2238, 0.10)]
    public void Survival_TabulatedCriticalValues_GiveTheirLevel(double lambda, double alpha)
    {
        // Kolmogorov distribution critical values (Smirnov 1948 table; from memory): 1.2238 at 10 %,
        // 1.3581 at 5 %, 1.6276 at 1 %.
        Assert.Equal(alpha, KolmogorovSmirnov.Survival(lambda), 4);
    }

    [Fact]
    public void Statistic_WithTiesAcrossSamples_IsTheLargestEcdfGap()
    {
        double[] a = [1, 2, 2, 3, 5];
        double[] b = [2, 2, 4, 4, 6, 7];

        // Oracle: the ECDF gap evaluated at every observed value, straight from the definition.
        double expected = a.Concat(b).Max(v => Math.Abs((a.Count(w => w <= v) / 5.0) - (b.Count(w => w <= v) / 6.0)));

        Assert.Equal(expected, KolmogorovSmirnov.TwoSample(a, b)!.Value.D, 15);
    }

    [Fact]
    public void TwoSample_SameDistribution_IsNotSignificantAndShiftedIs()
    {
        var random = new Random(3);
        var a = Generated.Normal(random, 2000);
        var b = Generated.Normal(random, 2000);
        var shifted = Generated.Normal(random, 2000, 0.3);

        Assert.True(KolmogorovSmirnov.TwoSample(a, b)!.Value.P > 0.01);
        Assert.True(KolmogorovSmirnov.TwoSample(a, shifted)!.Value.P < 1e-6);
    }

    [Fact]
    public void TwoSample_EmptySample_IsUndefined()
    {
        Assert.Null(KolmogorovSmirnov.TwoSample([], [1.0]));
    }
}
