using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Profiling;

/// <summary>Exact unit conversions (defined factors, NIST SP 811 appendix B), copies and non-linear derivations.</summary>
public sealed class ExactnessTests
{
    private static RelationshipProfile Profile(double[] x, double[] y) => Profiler.Profile(new PairedSample(x, y), Thresholds.Default);

    private static double[] Amounts(int seed, int n = 500, double low = 0.5, double high = 250) =>
        [.. Generated.Uniform(new Random(seed), n, low, high).Select(v => Math.Round(v, 1))];

    [Fact]
    public void Profile_KilogramsFromPounds_IsExactAffineWithTheDefinedFactor()
    {
        // NIST SP 811, appendix B: 1 lb = 0.45359237 kg exactly (the international avoirdupois pound).
        var lb = Amounts(1);
        var p = Profile(lb, [.. lb.Select(v => v * 0.45359237)]);

        Assert.True(p.ExactAffine);
        Assert.False(p.ExactIdentity);
        Assert.False(p.ExactMonotone);
        Assert.Equal("y = 0.45359237·x", p.Equation);
        Assert.Equal(Shape.Perfect, p.Shape);
        Assert.Equal(1.0, p.PearsonR!.Value, 14);
        NumericalAccuracyTests.AssertNoNonFinite(p);
    }

    [Fact]
    public void Profile_MegajoulesFromKilowattHours_IsExactAffineWithFactor36()
    {
        // NIST SP 811, appendix B: 1 kWh = 3.6 MJ exactly.
        var kwh = Amounts(2);
        var p = Profile(kwh, [.. kwh.Select(v => v * 3.6)]);

        Assert.True(p.ExactAffine);
        Assert.Equal("y = 3.6·x", p.Equation);
        Assert.Equal(Shape.Perfect, p.Shape);
    }

    [Fact]
    public void Profile_FahrenheitFromCelsius_ShowsSlopeAndIntercept()
    {
        // NIST SP 811, appendix B: t/°F = 1.8 · t/°C + 32 exactly.
        var celsius = Amounts(3, 300, -40, 45);
        var p = Profile(celsius, [.. celsius.Select(c => (1.8 * c) + 32)]);

        Assert.True(p.ExactAffine);
        Assert.Equal("y = 1.8·x + 32", p.Equation);
    }

    [Fact]
    public void Profile_NegativeSlopeAndIntercept_ReadsWithMinusSigns()
    {
        // Common practice: a remaining-balance column derived as 100 − 2·x.
        var x = Amounts(4, 100, 0, 40);
        var p = Profile(x, [.. x.Select(v => -2 * v - 100)]);

        Assert.True(p.ExactAffine);
        Assert.Equal("y = -2·x - 100", p.Equation);
        Assert.Equal(-1.0, p.PearsonR!.Value, 14);
    }

    [Fact]
    public void Profile_CopiedColumn_IsExactIdentity()
    {
        var x = Amounts(5);
        var p = Profile(x, [.. x]);

        Assert.True(p.ExactIdentity);
        Assert.True(p.ExactAffine);
        Assert.Equal("y = x", p.Equation);
        Assert.Equal(Shape.Perfect, p.Shape);
        Assert.Contains("copy", p.ShapeReason, StringComparison.Ordinal);
    }

    [Fact]
    public void Profile_ExponentialOfX_IsExactMonotoneNotAffine()
    {
        // exp is strictly increasing, so Spearman's ρ = 1 while the line is not exact (common practice).
        var x = Generated.Uniform(new Random(6), 400, 0, 5);
        var p = Profile(x, [.. x.Select(Math.Exp)]);

        Assert.False(p.ExactAffine);
        Assert.True(p.ExactMonotone);
        Assert.Equal(1.0, p.SpearmanRho);
        Assert.Equal(1.0, p.KendallTauB);
        Assert.Null(p.Equation);
        Assert.Equal(Shape.Monotone, p.Shape);
    }

    [Fact]
    public void Profile_DecreasingNonLinearFunction_IsExactMonotoneWithRhoMinusOne()
    {
        var x = Generated.Uniform(new Random(7), 300, 1, 50);
        var p = Profile(x, [.. x.Select(v => 1 / v)]);

        Assert.True(p.ExactMonotone);
        Assert.Equal(-1.0, p.SpearmanRho);
        Assert.Contains("decreasing", p.ShapeReason, StringComparison.Ordinal);
    }

    [Fact]
    public void Profile_ConversionRoundedToCents_IsNotAffineButStillExactMonotone()
    {
        // A value rounded after conversion carries up to half a cent of error, so the line is not exact
        // at the default tolerance; rounding keeps the order (0.1 lb steps are 4.5 cents apart), so the
        // derived column is still caught as an exact monotone function (|ρ| = 1).
        var lb = Amounts(8);
        var p = Profile(lb, [.. lb.Select(v => Math.Round(v * 0.45359237, 2))]);

        Assert.False(p.ExactAffine);
        Assert.True(p.ExactMonotone);
        Assert.Equal(Shape.Monotone, p.Shape);
        Assert.True(p.PearsonR > 0.99999);
    }

    [Fact]
    public void Profile_ConversionRoundedToCents_IsExactWithALooserTolerance()
    {
        var lb = Amounts(8);
        var loose = Thresholds.Default with { ExactRelativeTolerance = 1e-3 };
        var p = Profiler.Profile(new PairedSample(lb, [.. lb.Select(v => Math.Round(v * 0.45359237, 2))]), loose);

        Assert.True(p.ExactAffine);
        Assert.StartsWith("y = 0.4535", p.Equation, StringComparison.Ordinal);
    }

    [Fact]
    public void Profile_ExactShiftOnHugeOffset_IsExact()
    {
        // y = x − 1e9 is computed exactly (Sterbenz lemma); x's own rounding at 1e9 must not read as error.
        var x = Generated.Uniform(new Random(9), 200, 0, 1).Select(v => 1e9 + v).ToArray();
        var p = Profile(x, [.. x.Select(v => v - 1e9)]);

        Assert.True(p.ExactAffine);
        Assert.Equal("y = x - 1000000000", p.Equation);
    }
}
