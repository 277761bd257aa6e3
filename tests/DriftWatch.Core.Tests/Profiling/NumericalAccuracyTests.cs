using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Profiling;

/// <summary>NIST StRD univariate NumAcc sets, extreme magnitudes, constant columns and tiny samples.</summary>
public sealed class NumericalAccuracyTests
{
    private static RelationshipProfile Profile(double[] x, double[] y) => Profiler.Profile(new PairedSample(x, y), Thresholds.Default);

    private static double Lre(double actual, double certified) =>
        actual == certified ? 15 : -Math.Log10(Math.Abs(actual - certified) / Math.Abs(certified));

    public static TheoryData<string, double[], double, double, double> NumAccSets => new()
    {
        // NIST StRD NumAcc1 (from memory): 10000001, 10000003, 10000002; mean 10000002, SD 1.
        { "NumAcc1", [10000001, 10000003, 10000002], 10000002, 1, 14 },

        // NIST StRD NumAcc2 (from memory): mean 1.2, SD 0.1.
        { "NumAcc2", ReferenceData.NumAcc(1.1, 1.2, 1.3), 1.2, 0.1, 13 },

        // NIST StRD NumAcc3 (from memory): mean 1000000.2, SD 0.1.
        { "NumAcc3", ReferenceData.NumAcc(1000000.1, 1000000.2, 1000000.3), 1000000.2, 0.1, 9 },

        // NIST StRD NumAcc4 (NIST description): mean 10000000.2, SD 0.1. The data's own decimal-to-binary
        // rounding (1e7 has ulp 1.9e-9) limits the SD to about 8 digits for any algorithm.
        { "NumAcc4", ReferenceData.NumAcc(10000000.1, 10000000.2, 10000000.3), 10000000.2, 0.1, 7.5 },
    };

    [Theory]
    [MemberData(nameof(NumAccSets))]
    public void Profile_NistNumAccColumn_MatchesCertifiedMeanAndSd(string set, double[] values, double mean, double sd, double minDigits)
    {
        var p = Profile(values, [.. values.Select((_, i) => (double)i)]);

        Assert.True(Lre(p.XMean!.Value, mean) >= 14, $"{set} mean {p.XMean}");
        double digits = Lre(p.XSd!.Value, sd);
        Assert.True(digits >= minDigits, $"{set} SD {p.XSd:R} agrees to {digits:F1} digits");
    }

    [Fact]
    public void Profile_NaiveSumOfSquaresOnNumAcc4_WouldLoseTheSd()
    {
        // NIST StRD NumAcc4: the textbook one-pass formula Σx² − (Σx)²/n loses the SD entirely, which
        // is why the profiler centres first. This guards the test above against a weak data set.
        var values = ReferenceData.NumAcc(10000000.1, 10000000.2, 10000000.3);
        double sum = values.Sum(), sumSquares = values.Sum(v => v * v);
        double naive = Math.Sqrt(Math.Max(0, (sumSquares - (sum * sum / values.Length)) / (values.Length - 1)));

        Assert.True(Lre(naive, 0.1) < 3);
        Assert.True(Lre(Profile(values, [.. values.Select((_, i) => (double)i)]).XSd!.Value, 0.1) >= 7.5);
    }

    [Theory]
    [InlineData(1e6)]
    [InlineData(1e7)]
    [InlineData(1e9)]
    public void Profile_PairOnHugeCommonOffset_MatchesTheSameProfileWithoutTheOffset(double offset)
    {
        // The NumAcc3/NumAcc4 situation as a pair: x = offset + NumAcc-like spread, y = x + small noise.
        // Subtracting the offset from values within a factor 2 of it is exact (Sterbenz lemma), so
        // MathNet's Pearson on the shifted values is an independent oracle.
        var random = new Random(11);
        var spread = Generated.Normal(random, 1001, 0, 0.1);
        var noise = Generated.Normal(random, 1001, 0, 0.01);
        var x = spread.Select(s => offset + s).ToArray();
        var y = x.Select((v, i) => v + noise[i]).ToArray();
        var shiftedX = x.Select(v => v - offset).ToArray();
        var shiftedY = y.Select(v => v - offset).ToArray();

        var p = Profile(x, y);

        double oracle = MathNet.Numerics.Statistics.Correlation.Pearson(shiftedX, shiftedY);
        Assert.Equal(oracle, p.PearsonR!.Value, 9);
        var shifted = Profile(shiftedX, shiftedY);
        Assert.Equal(shifted.Slope!.Value, p.Slope!.Value, 7);
        Assert.Equal(shifted.ResidualSd!.Value, p.ResidualSd!.Value, 9);
        Assert.False(p.ExactAffine);
        Assert.Equal(Shape.Linear, p.Shape);
    }

    [Theory]
    [InlineData(1e150)]
    [InlineData(1e-150)]
    [InlineData(1e300)]
    public void Profile_ExtremeMagnitudes_NoOverflowAndSameFiguresAsUnitScale(double scale)
    {
        // Squares of 1e150 overflow a double (common practice); r and R² are scale-free and slope
        // and SDs scale linearly, so the unit-scale profile is the oracle.
        var random = new Random(5);
        var x = Generated.Uniform(random, 200, 1, 10);
        var y = Generated.Line(random, x, 3, 2, 1);
        var unit = Profile(x, y);
        var big = Profile([.. x.Select(v => v * scale)], [.. y.Select(v => v * scale)]);

        Assert.Equal(unit.PearsonR!.Value, big.PearsonR!.Value, 12);
        Assert.Equal(unit.SpearmanRho!.Value, big.SpearmanRho!.Value, 12);
        Assert.Equal(unit.RSquared!.Value, big.RSquared!.Value, 12);
        Assert.Equal(1.0, big.XSd!.Value / (unit.XSd!.Value * scale), 12);
        Assert.Equal(1.0, big.Slope!.Value / unit.Slope!.Value, 12);
        Assert.Equal(1.0, big.ResidualSd!.Value / (unit.ResidualSd!.Value * scale), 12);
        Assert.Equal(unit.Shape, big.Shape);
        Assert.Equal(unit.QuadraticP!.Value, big.QuadraticP!.Value, 9);
    }

    [Theory]
    [InlineData(1e-310)]
    [InlineData(5e306)]
    public void Profile_EdgeOfTheDoubleRange_StaysFiniteAndClose(double scale)
    {
        // Subnormal inputs carry fewer digits themselves, and y · 5e306 comes within a factor 1.5 of double.MaxValue:
        // figures must stay finite and close to the unit-scale ones.
        var random = new Random(6);
        var x = Generated.Uniform(random, 200, 1, 10);
        var y = Generated.Line(random, x, 3, 2, 1);
        var unit = Profile(x, y);
        var edge = Profile([.. x.Select(v => v * scale)], [.. y.Select(v => v * scale)]);

        AssertNoNonFinite(edge);
        Assert.Equal(200, edge.NUsed);
        Assert.Equal(unit.PearsonR!.Value, edge.PearsonR!.Value, 5);
        Assert.Equal(unit.Shape, edge.Shape);
        Assert.NotNull(edge.Slope);
    }

    [Fact]
    public void Profile_ConstantX_IsUndefinedWithReasonAndNoNaN()
    {
        var p = Profile([5, 5, 5, 5], [1, 2, 3, 4]);

        Assert.Equal(Shape.Undefined, p.Shape);
        Assert.Contains("x is constant", p.ShapeReason, StringComparison.Ordinal);
        Assert.Equal(0.0, p.XSd);
        Assert.Null(p.PearsonR);
        Assert.Null(p.Slope);
        AssertNoNonFinite(p);
    }

    [Fact]
    public void Profile_ConstantTenths_HasSdExactlyZero()
    {
        // 0.1 · 3 / 3 is not 0.1 in binary; a constant column must still have SD 0 and mean 0.1 exactly.
        var p = Profile([0.1, 0.1, 0.1], [1, 2, 3]);

        Assert.Equal(0.1, p.XMean);
        Assert.Equal(0.0, p.XSd);
        Assert.Equal(Shape.Undefined, p.Shape);
    }

    [Fact]
    public void Profile_BothConstant_IsUndefinedAndSaysBoth()
    {
        var p = Profile([2, 2, 2], [7, 7, 7]);

        Assert.Equal(Shape.Undefined, p.Shape);
        Assert.Contains("Both columns are constant", p.ShapeReason, StringComparison.Ordinal);
        AssertNoNonFinite(p);
    }

    [Theory]
    [InlineData(0)]
    [InlineData(1)]
    [InlineData(2)]
    public void Profile_FewerThanThreeRows_IsUndefinedWithReason(int n)
    {
        var p = Profile([.. Enumerable.Range(0, n).Select(i => (double)i)], [.. Enumerable.Range(0, n).Select(i => (double)(2 * i))]);

        Assert.Equal(Shape.Undefined, p.Shape);
        Assert.False(string.IsNullOrWhiteSpace(p.ShapeReason));
        Assert.Null(p.PearsonR);
        Assert.Equal(n, p.NUsed);
        AssertNoNonFinite(p);
    }

    [Fact]
    public void Profile_CountsAndNonFiniteRowsInArrays_AreDroppedAndCounted()
    {
        var sample = new PairedSample([1, 2, double.NaN, 4, 5, 6], [2, 4, 6, double.PositiveInfinity, 10, 12], nullCount: 3, nonFiniteCount: 1, nonNumericCount: 2);

        var p = Profiler.Profile(sample, Thresholds.Default);

        Assert.Equal(4, p.NUsed);
        Assert.Equal(3, p.NNull);
        Assert.Equal(3, p.NNonfinite);
        Assert.Equal(2, p.NNonNumeric);
        Assert.Equal(12, p.NRows);
        Assert.True(p.ExactAffine);
        AssertNoNonFinite(p);
    }

    internal static void AssertNoNonFinite(RelationshipProfile p)
    {
        foreach (var property in typeof(RelationshipProfile).GetProperties())
        {
            if (property.GetValue(p) is double d)
            {
                Assert.True(double.IsFinite(d), $"{property.Name} = {d}");
            }
        }
    }
}
