using DriftWatch.Core.Baselines;
using MathNet.Numerics.Distributions;

namespace DriftWatch.Core.Tests.Baselines;

public sealed class PointReservoirTests
{
    [Fact]
    public void ToSample_FewerPointsThanCapacity_KeepsAllInOrder()
    {
        var reservoir = new PointReservoir(10, 7);
        for (var i = 0; i < 4; i++)
        {
            reservoir.Add(i, -i);
        }

        var sample = reservoir.ToSample();
        Assert.Equal(new double[] { 0, 1, 2, 3 }, sample.X);
        Assert.Equal(new double[] { 0, -1, -2, -3 }, sample.Y);
        Assert.Equal(4, reservoir.Seen);
    }

    [Fact]
    public void ToSample_MorePointsThanCapacity_KeepsCapacityDistinctOfferedPointsWithPairsIntact()
    {
        var reservoir = new PointReservoir(50, 1);
        for (var i = 0; i < 1000; i++)
        {
            reservoir.Add(i, (3 * i) + 0.5);
        }

        var sample = reservoir.ToSample();
        Assert.Equal(50, sample.UsedCount);
        Assert.Equal(50, sample.X.Distinct().Count());
        for (var i = 0; i < sample.UsedCount; i++)
        {
            Assert.InRange(sample.X[i], 0, 999);
            Assert.Equal((3 * sample.X[i]) + 0.5, sample.Y[i]);
        }
    }

    [Fact]
    public void ToSample_SameSeedSameStream_SameSample_OtherSeedDiffers()
    {
        static double[] Draw(int seed)
        {
            var r = new PointReservoir(20, seed);
            for (var i = 0; i < 500; i++)
            {
                r.Add(i, i);
            }

            return r.ToSample().X;
        }

        // Two independent draws with the same seed must agree element by element (the reservoir is seeded, not random).
        var first = Draw(42);
        var second = Draw(42);
        Assert.Equal(first, second);
        Assert.NotEqual(Draw(42), Draw(43));
    }

    // Algorithm R keeps every element with probability k/n (Vitter 1985, "Random sampling with a reservoir",
    // ACM TOMS 11(1)). Over many seeded draws the inclusion counts of the 20 positions must pass a
    // chi-square goodness-of-fit test against the uniform expectation (critical value from MathNet.Numerics).
    [Fact]
    public void Add_ManyDraws_EachPositionKeptWithProbabilityCapacityOverN()
    {
        const int n = 20, k = 5, draws = 4000;
        var counts = new int[n];
        for (var seed = 0; seed < draws; seed++)
        {
            var reservoir = new PointReservoir(k, seed);
            for (var i = 0; i < n; i++)
            {
                reservoir.Add(i, i);
            }

            foreach (var x in reservoir.ToSample().X)
            {
                counts[(int)x]++;
            }
        }

        var expected = draws * k / (double)n;
        var chiSquare = counts.Sum(c => (c - expected) * (c - expected) / expected);
        var critical = ChiSquared.InvCDF(n - 1, 0.999);
        Assert.True(chiSquare < critical, $"chi-square {chiSquare:F1} exceeds the 0.999 quantile {critical:F1}; counts {string.Join(",", counts)}");
    }
}
