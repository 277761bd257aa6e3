using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Profiling;

/// <summary>Anscombe, F. J. (1973), "Graphs in Statistical Analysis", The American Statistician 27(1), 17–21.</summary>
public sealed class AnscombeTests
{
    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    [InlineData(4)]
    public void Profile_EachSet_HasThePublishedSummaryFigures(int set)
    {
        var p = Profiler.Profile(ReferenceData.Anscombe(set), Thresholds.Default);

        // Anscombe (1973): mean x = 9, variance x = 11, mean y = 7.50, r = 0.816, y = 3.00 + 0.500x
        // (set 4's r is 0.8165, which the paper's three decimals print as 0.816 or 0.817).
        Assert.Equal(11, p.NUsed);
        Assert.Equal(9.0, p.XMean!.Value, 12);
        Assert.Equal(11.0, p.XSd!.Value * p.XSd.Value, 10);
        Assert.Equal(7.50, Math.Round(p.YMean!.Value, 2));
        Assert.InRange(p.PearsonR!.Value, 0.8155, 0.8166);
        Assert.Equal(3.00, Math.Round(p.Intercept!.Value, 2));
        Assert.Equal(0.500, Math.Round(p.Slope!.Value, 3));

        // Anscombe (1973) prints the variance of y as 4.12 (4.13 for set 2 in some reprints): to 1 decimal it is 4.1.
        Assert.Equal(4.1, Math.Round(p.YSd!.Value * p.YSd.Value, 1));
    }

    [Theory]
    [InlineData(1, Shape.Linear)]
    [InlineData(2, Shape.Curved)]
    [InlineData(3, Shape.Outlier)]
    [InlineData(4, Shape.Leverage)]
    public void Profile_EachSet_HasTheShapeTheQuartetIllustrates(int set, Shape expected)
    {
        // Anscombe (1973): set 1 a linear cloud, set 2 a smooth curve, set 3 a line with one outlier,
        // set 4 one point that alone sets the slope.
        var p = Profiler.Profile(ReferenceData.Anscombe(set), Thresholds.Default);

        Assert.Equal(expected, p.Shape);
        Assert.False(string.IsNullOrWhiteSpace(p.ShapeReason));
    }

    [Fact]
    public void Profile_SetThree_FindsExactlyOneOutlierWhoseRemovalMakesTheLineNearlyExact()
    {
        // Anscombe (1973): in set 3 ten points lie on a line and one (x = 13) lies far above it.
        var p = Profiler.Profile(ReferenceData.Anscombe(3), Thresholds.Default);

        Assert.Equal(1, p.OutlierCount);
        Assert.True(p.PearsonRWithoutTopInfluence > 0.9999);
    }

    [Fact]
    public void Profile_SetFour_ReportsUnitLeverageWithoutNaN()
    {
        // Anscombe (1973): set 4 has x = 8 on ten rows and x = 19 on one; that row's hat value is 1
        // (h = 1/n + (x − x̄)²/Sxx = 1/11 + 100/110), so Cook's D of that row is undefined.
        var p = Profiler.Profile(ReferenceData.Anscombe(4), Thresholds.Default);

        Assert.Equal(1.0, p.MaxLeverage!.Value, 12);
        Assert.Null(p.PearsonRWithoutTopInfluence);
        Assert.Null(p.QuadraticP);
        Assert.Equal(2, p.DistinctX);
        Assert.True(p.MaxCooksDistance is null || double.IsFinite(p.MaxCooksDistance.Value));
    }

    [Fact]
    public void Profile_SetOne_MatchesRsCorTestForPValueAndInterval()
    {
        // R, cor.test(anscombe$x1, anscombe$y1) (from memory): t = 4.2415, df = 9, p-value = 0.00217,
        // 95 percent confidence interval 0.4243912 0.9506933.
        var p = Profiler.Profile(ReferenceData.Anscombe(1), Thresholds.Default);

        Assert.Equal(0.00217, p.PearsonP!.Value, 5);
        Assert.Equal(0.4243912, p.PearsonCiLow!.Value, 6);
        Assert.Equal(0.9506933, p.PearsonCiHigh!.Value, 6);
    }
}
