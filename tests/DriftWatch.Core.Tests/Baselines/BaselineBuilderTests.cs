using DriftWatch.Core.Baselines;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using MathNet.Numerics.Statistics;
using static DriftWatch.Core.Tests.Baselines.BaselineTestRuns;

namespace DriftWatch.Core.Tests.Baselines;

public sealed class BaselineBuilderTests
{
    private static readonly BaselinePolicy FirstThree = new() { Kind = BaselinePolicyKind.FirstRuns, FirstRuns = 3 };

    [Fact]
    public void Build_UnderCapacity_PoolsEveryPointAndProfilesThePool()
    {
        var a = Run(1, 0, [1, 2, 3, 4], [2.0, 4.1, 5.9, 8.2]);
        var b = Run(2, 1, [5, 6, 7], [9.8, 12.1, 14.0]);
        var now = T0.AddDays(1);

        var baseline = BaselineBuilder.Build("p", FirstThree, [b, a], now, MathNetProfile)!;

        // Oracle: MathNet's Pearson over the concatenation of both runs' points.
        double[] allX = [1, 2, 3, 4, 5, 6, 7];
        double[] allY = [2.0, 4.1, 5.9, 8.2, 9.8, 12.1, 14.0];
        Assert.Equal(allX, baseline.Points.X);
        Assert.Equal(allY, baseline.Points.Y);
        Assert.Equal(Correlation.Pearson(allX, allY), baseline.Profile.PearsonR!.Value, 12);
        Assert.Equal(2, baseline.RunCount);
        Assert.Equal(a.StartedAt, baseline.CoversFrom);
        Assert.Equal(b.StartedAt, baseline.CoversTo);
        Assert.Equal(now, baseline.CreatedAt);
        Assert.Equal(BaselinePolicyKind.FirstRuns, baseline.Policy);
        Assert.Equal("first_runs: 3", baseline.PolicyText);
        Assert.Equal(3.5, baseline.MeanRunUsed);
        // Counts are a typical run's (mean of 4 and 3, rounded half away from zero), not the pool's 7.
        Assert.Equal(4, baseline.Profile.NUsed);
        Assert.Equal(7, baseline.Points.UsedCount);
        Assert.False(baseline.Accepted);
    }

    [Fact]
    public void Build_OverCapacity_KeepsCapacityPointsFromEveryRun()
    {
        var runs = Enumerable.Range(0, 4).Select(i => LineRun(i + 1, i, 1000, offset: i * 1000)).ToList();

        var baseline = BaselineBuilder.Build("p", FirstThree, runs, T0, MathNetProfile, capacity: 400)!;

        Assert.Equal(400, baseline.Points.UsedCount);
        Assert.Equal(400, baseline.Points.X.Distinct().Count());
        // Each run offered a quarter of the stream; a uniform reservoir draws from all four
        // (probability that any run is missed is below 4·0.75^400).
        for (var run = 0; run < 4; run++)
        {
            Assert.Contains(baseline.Points.X, x => x >= run * 1000 && x < (run + 1) * 1000);
        }

        Assert.All(Enumerable.Range(0, 400), i => Assert.Equal((2 * baseline.Points.X[i]) + 1, baseline.Points.Y[i]));
    }

    [Fact]
    public void Build_SameRunsAnyOrder_SameBaseline()
    {
        var runs = Enumerable.Range(0, 5).Select(i => LineRun(i + 1, i, 300, offset: i * 300)).ToList();
        var shuffled = new[] { runs[3], runs[0], runs[4], runs[2], runs[1] };

        var one = BaselineBuilder.Build("p", FirstThree, runs, T0, MathNetProfile, capacity: 100)!;
        var two = BaselineBuilder.Build("p", FirstThree, shuffled, T0, MathNetProfile, capacity: 100)!;
        var otherPair = BaselineBuilder.Build("q", FirstThree, runs, T0, MathNetProfile, capacity: 100)!;

        Assert.Equal(one.Points.X, two.Points.X);
        Assert.NotEqual(one.Points.X, otherPair.Points.X);
    }

    [Fact]
    public void Build_SkipsFailedAndPrunedRuns_NullWhenNothingLeft()
    {
        var failed = LineRun(1, 0, 10, status: RunStatus.Failed);
        var pruned = LineRun(2, 1, 10, withPoints: false);
        var good = LineRun(3, 2, 10, offset: 100);

        Assert.Null(BaselineBuilder.Build("p", FirstThree, [failed, pruned], T0, MathNetProfile));
        var baseline = BaselineBuilder.Build("p", FirstThree, [failed, pruned, good], T0, MathNetProfile)!;
        Assert.Equal(1, baseline.RunCount);
        Assert.Equal(good.Points!.X, baseline.Points.X);
    }

    [Fact]
    public void Build_ScalesDropCountsToThePool_SoTheNullRateIsThePooledRate()
    {
        // Run A: 1000 used, 100 null; run B: 1000 used, 300 null. Pooled null rate 400 / 2400 = 1/6.
        var a = LineRun(1, 0, 1000, nulls: 100);
        var b = LineRun(2, 1, 1000, offset: 1000, nulls: 300);

        var baseline = BaselineBuilder.Build("p", FirstThree, [a, b], T0, MathNetProfile, capacity: 500)!;

        Assert.Equal(500, baseline.Points.UsedCount);
        Assert.Equal(100, baseline.Points.NullCount); // 400 · 500 / 2000
        Assert.Equal(1.0 / 6, baseline.Points.NullCount / (double)baseline.Points.RowCount, 12);
        Assert.Equal(1000, baseline.MeanRunUsed);
        Assert.Equal(1000, baseline.Profile.NUsed);
        Assert.Equal(200, baseline.Profile.NNull);
        Assert.Equal(1200, baseline.Profile.NRows);
    }

    [Fact]
    public void Build_ManySmallRuns_ProfileCountsMatchOneRun_SoAFreshRunDoesNotLookShrunk()
    {
        var runs = Enumerable.Range(0, 10).Select(i => LineRun(i + 1, i, 300, offset: i * 300)).ToList();

        var baseline = BaselineBuilder.Build("p", FirstThree, runs, T0, MathNetProfile)!;

        Assert.Equal(3000, baseline.Points.UsedCount);
        Assert.Equal(300, baseline.Profile.NUsed);
        Assert.Equal(300, baseline.Profile.NRows);
    }
}
