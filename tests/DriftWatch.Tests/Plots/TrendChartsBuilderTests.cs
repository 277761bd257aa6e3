using DriftWatch.Core.Baselines;
using DriftWatch.Plots;

namespace DriftWatch.Tests.Plots;

public sealed class TrendChartsBuilderTests
{
    private static TrendPoint At(int day, double value) => new(new DateTimeOffset(2026, 3, day, 6, 0, 0, TimeSpan.Zero), value, null);

    [Fact]
    public void Limits_RNearOne_TheAxisStopsAtOne()
    {
        // A correlation lies in [−1, 1] by definition; padding must not push the axis past it.
        var limits = TrendChartsBuilder.Limits([At(1, 0.97), At(2, 0.99), At(3, 0.999)], new NormalRange(0.985, 0.95, 0.9995), -1, 1);

        Assert.Equal(1, limits.Max);
        Assert.True(limits.Min is < 0.95 and > 0.9, $"lower limit {limits.Min}");
    }

    [Fact]
    public void Limits_RFromMinusOneToOne_ClampedOnBothSides()
    {
        var limits = TrendChartsBuilder.Limits([At(1, -0.99), At(2, 0.99)], null, -1, 1);

        Assert.Equal((-1.0, 1.0), (limits.Min, limits.Max));
    }

    [Fact]
    public void Limits_ContainEveryRunAndTheBand()
    {
        var limits = TrendChartsBuilder.Limits([At(1, 0.31), At(2, 0.5)], new NormalRange(0.31, 0.29, 0.33));

        Assert.True(limits.Contains(0.29) && limits.Contains(0.5), $"{limits}");
    }
}
