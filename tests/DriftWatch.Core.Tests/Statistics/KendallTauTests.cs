using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Tests.Statistics;

public sealed class KendallTauTests
{
    [Theory]
    [InlineData(1, 10)]
    [InlineData(2, 100)]
    [InlineData(3, 1000)]
    [InlineData(4, 17)]
    public void CountInversions_RandomIntegers_EqualsNaivePairCount(int seed, int n)
    {
        var random = new Random(seed);
        var values = Enumerable.Range(0, n).Select(_ => random.Next(n / 3 + 1)).ToArray();
        long naive = 0;
        for (int i = 0; i < n; i++)
        {
            for (int j = i + 1; j < n; j++)
            {
                naive += values[i] > values[j] ? 1 : 0;
            }
        }

        var sorted = values.Order().ToArray();
        long counted = KendallTau.CountInversions(values);

        // Knight (1966): the swaps of a merge sort are the discordant pairs; ties are not swaps.
        Assert.Equal(naive, counted);
        Assert.Equal(sorted, values);
    }

    [Fact]
    public void TauB_ReversedOrder_IsMinusOne()
    {
        var x = Ranking.Of([1, 2, 3, 4, 5, 6]);
        var y = Ranking.Of([6, 5, 4, 3, 2, 1]);

        Assert.Equal(-1.0, KendallTau.TauB(x, y));
    }

    [Fact]
    public void TauB_ConstantColumn_IsUndefined()
    {
        Assert.Null(KendallTau.TauB(Ranking.Of([1, 2, 3]), Ranking.Of([4, 4, 4])));
    }
}
