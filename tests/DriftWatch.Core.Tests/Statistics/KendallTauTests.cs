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
        int distinct = (n / 3) + 1;
        long byFenwick = KendallTau.CountInversionsFenwick(values, distinct);
        long byMerge = KendallTau.CountInversions(values);

        // Knight (1966): the swaps of a merge sort are the discordant pairs; ties are not swaps. The
        // Fenwick count must agree with the naive count too.
        Assert.Equal(naive, byMerge);
        Assert.Equal(sorted, values);
        Assert.Equal(naive, byFenwick);
    }

    [Fact]
    public void TauB_ManyDistinctValues_UsesTheMergeCountAndAgreesWithFewDistinct()
    {
        // Above FenwickMaxDistinct the merge sort counts; the same data coarsened to few levels goes
        // through the Fenwick tree. Each is checked against Knight's identity on its own data by the
        // naive test above; here both paths run inside τ-b on data of both kinds.
        var random = new Random(9);
        int n = KendallTau.FenwickMaxDistinct + 5000;
        var x = Generated.Normal(random, n);
        var y = x.Select(v => v + Generated.Normal(random, 1)[0]).ToArray();
        var fine = KendallTau.TauB(Ranking.Of(x), Ranking.Of(y))!.Value;
        var coarseX = x.Select(v => Math.Round(v, 1)).ToArray();
        var coarseY = y.Select(v => Math.Round(v, 1)).ToArray();
        var coarse = KendallTau.TauB(Ranking.Of(coarseX), Ranking.Of(coarseY))!.Value;

        Assert.True(Ranking.Of(y).Distinct > KendallTau.FenwickMaxDistinct);
        Assert.True(Ranking.Of(coarseY).Distinct <= KendallTau.FenwickMaxDistinct);

        // Population τ of a bivariate normal with ρ = 1/√2 is (2/π)·asin ρ = 0.5 (Kendall 1938; common practice).
        Assert.Equal(0.5, fine, 0.01);
        Assert.Equal(0.5, coarse, 0.02);
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
