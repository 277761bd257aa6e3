using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Profiling;

/// <summary>
/// Exactness where float64 itself is coarse: 64-bit integers near 2^63 and values near 1e300.
/// IEEE 754 binary64 has a 52-bit fraction, so the spacing of doubles in [2^62, 2^63) is 2^10 = 1024
/// (common practice); the integer columns below are built in exact long arithmetic and then rounded to
/// the nearest double, as PostgreSQL's bigint::float8 and .NET's (double)long both do.
/// </summary>
public sealed class ExactnessAtFloatLimitsTests
{
    private const long NearTop = 9_200_000_000_000_000_000; // just below 2^63 − 1 = 9 223 372 036 854 775 807

    private static RelationshipProfile Profile(double[] x, double[] y) => Profiler.Profile(new PairedSample(x, y), Thresholds.Default);

    private static long[] Integers(Random random, int n, double sd) =>
        [.. Generated.Normal(random, n, 0, sd).Select(v => (long)Math.Round(v))];

    [Fact]
    public void DoubleSpacing_Near2To62_Is1024()
    {
        // IEEE 754 binary64 (common practice): 2^62 · 2^-52.
        Assert.Equal(1024.0, Math.BitIncrement(Math.ScaleB(1.0, 62)) - Math.ScaleB(1.0, 62));
    }

    [Fact]
    public void Profile_Int64NearTwoTo63WithRealNoise_IsNotExactAffine()
    {
        // y = c − dx + e with SD(dx) = 20 000 and SD(e) = 4 000: r = −1/√1.04 ≈ −0.98. The spread is only
        // about 20 double steps, so a tolerance from the magnitude alone (16 ε · 9.2e18 ≈ 33 000) swallowed
        // the real residuals and called the pair exact.
        var random = new Random(63);
        var dx = Integers(random, 500, 20_000);
        var e = Integers(random, 500, 4_000);
        var x = dx.Select(d => (double)(NearTop + d)).ToArray();
        var y = dx.Select((d, i) => (double)(NearTop - d + e[i])).ToArray();

        var p = Profile(x, y);

        // Oracle: MathNet.Numerics' Pearson on the exact integer deviations (long subtraction is exact).
        double oracle = MathNet.Numerics.Statistics.Correlation.Pearson(dx.Select(d => (double)d), dx.Select((d, i) => (double)(e[i] - d)));
        Assert.InRange(oracle, -0.99, -0.97);
        // Rounding to 1024-steps adds variance 1024²/12 ≈ 0.2 % of e's: r moves by well under 0.005.
        Assert.InRange(p.PearsonR!.Value, oracle - 0.005, oracle + 0.005);
        Assert.False(p.ExactAffine);
        Assert.False(p.ExactIdentity);
        Assert.False(p.ExactMonotone);
        Assert.Null(p.Equation);
        Assert.NotEqual(Shape.Perfect, p.Shape);
    }

    [Fact]
    public void Profile_Int64NearTwoTo63WithSmallNoise_IsNotACopy()
    {
        // y = x + e, SD(e) = 3 000 against SD(x) = 20 000 (r ≈ 0.99): not a copied column, although every
        // |y − x| is below 16 ε · 9.2e18.
        var random = new Random(64);
        var dx = Integers(random, 500, 20_000);
        var e = Integers(random, 500, 3_000);
        var x = dx.Select(d => (double)(NearTop + d)).ToArray();
        var y = dx.Select((d, i) => (double)(NearTop + d + e[i])).ToArray();

        var p = Profile(x, y);

        Assert.False(p.ExactIdentity);
        Assert.False(p.ExactAffine);
    }

    [Fact]
    public void Profile_Int64PlusOneNearTwoTo62_IsACopyAtFloat64Resolution()
    {
        // y = x + 1 in exact 64-bit integers, x spread over 1e10 above 2^62. As doubles the +1 is below the
        // spacing of 1024, so y and x round to the same double on almost every row, and to neighbours on
        // the rest: float64 can honestly say only "y equals x to within its resolution", which reads as a copy.
        var random = new Random(62);
        long baseValue = 1L << 62;
        var offsets = Generated.Uniform(random, 500, 0, 1e10).Select(v => (long)v).ToArray();
        var x = offsets.Select(o => (double)(baseValue + o)).ToArray();
        var y = offsets.Select(o => (double)(baseValue + o + 1)).ToArray();
        Assert.All(x.Zip(y), xy => Assert.InRange(xy.Second - xy.First, 0, 1024));

        var p = Profile(x, y);

        Assert.True(p.ExactAffine);
        Assert.True(p.ExactIdentity);
        Assert.Equal("y = x", p.Equation);
    }

    [Fact]
    public void Profile_DoubledValuesNear1e300_IsExactAffine()
    {
        // Doubling is exact in binary floating point (common practice), and 2 · 5e300 is far below double.MaxValue.
        var x = Generated.Uniform(new Random(300), 400, 0.5e300, 5e300);
        var p = Profile(x, [.. x.Select(v => 2 * v)]);

        Assert.True(p.ExactAffine);
        Assert.False(p.ExactIdentity);
        Assert.Equal("y = 2·x", p.Equation);
        Assert.Equal(1.0, p.PearsonR!.Value, 14);
        NumericalAccuracyTests.AssertNoNonFinite(p);
    }

    [Fact]
    public void Profile_AffineNear1e300WithRoundedResults_IsExactAffine()
    {
        // y = 3x − 1e300 computed in doubles: each y carries up to half a step of rounding at its own
        // magnitude, which is what the rounding allowance is for.
        var x = Generated.Uniform(new Random(301), 400, 1e299, 1e300);
        var p = Profile(x, [.. x.Select(v => (3 * v) - 1e300)]);

        Assert.True(p.ExactAffine);
        Assert.Equal(3.0, p.Slope!.Value, 12);
        Assert.Equal(1.0, p.PearsonR!.Value, 14);
    }

    [Fact]
    public void Profile_NoisyLineNear1e300_IsNotExact()
    {
        // Control for the tests above: the same magnitude with real noise (SD 1 % of the spread).
        var random = new Random(302);
        var x = Generated.Uniform(random, 400, 1e299, 1e300);
        var p = Profile(x, Generated.Line(random, x, 0, 2, 3e297));

        Assert.False(p.ExactAffine);
        Assert.True(p.PearsonR > 0.99);
    }
}
