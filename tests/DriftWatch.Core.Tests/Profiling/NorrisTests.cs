using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Profiling;

/// <summary>NIST StRD Linear Least Squares Regression, data set Norris: certified values.</summary>
public sealed class NorrisTests
{
    private static readonly RelationshipProfile Profile = Profiler.Profile(ReferenceData.Norris(), Thresholds.Default);

    /// <summary>Number of correct significant digits (NIST's log relative error, LRE).</summary>
    private static double Lre(double actual, double certified) =>
        actual == certified ? 15 : -Math.Log10(Math.Abs(actual - certified) / Math.Abs(certified));

    [Theory]
    [InlineData("intercept", -0.262323073774029)]
    [InlineData("intercept_se", 0.232818234301152)]
    [InlineData("slope", 1.00211681802045)]
    [InlineData("slope_se", 0.429796848199937E-03)]
    [InlineData("residual_sd", 0.884796396144373)]
    [InlineData("r_squared", 0.999993745883712)]
    public void Profile_Norris_MatchesCertifiedValueToNineDigits(string quantity, double certified)
    {
        // NIST StRD Norris certified values (see Data/README.md).
        double? actual = quantity switch
        {
            "intercept" => Profile.Intercept,
            "intercept_se" => Profile.InterceptSe,
            "slope" => Profile.Slope,
            "slope_se" => Profile.SlopeSe,
            "residual_sd" => Profile.ResidualSd,
            "r_squared" => Profile.RSquared,
            _ => null,
        };

        Assert.NotNull(actual);
        double lre = Lre(actual.Value, certified);
        Assert.True(lre >= 9, $"{quantity}: {actual} against certified {certified} agrees to {lre:F1} digits");
    }

    [Fact]
    public void Profile_Norris_UsesAllThirtySixObservations()
    {
        // NIST StRD Norris: 36 observations.
        Assert.Equal(36, Profile.NUsed);
        Assert.Equal(Shape.Linear, Profile.Shape);
    }
}
