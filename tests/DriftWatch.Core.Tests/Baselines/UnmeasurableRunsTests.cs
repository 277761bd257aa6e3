using DriftWatch.Core.Baselines;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using static DriftWatch.Core.Tests.Baselines.BaselineTestRuns;

namespace DriftWatch.Core.Tests.Baselines;

/// <summary>
/// An unmeasurable run keeps its profile and any points (so its counts are visible), but a baseline must never
/// pool it: a window of one repeated value would make the reference itself undefined.
/// </summary>
public sealed class UnmeasurableRunsTests
{
    private static readonly BaselinePolicy FirstTwo = new() { Kind = BaselinePolicyKind.FirstRuns, FirstRuns = 2 };

    /// <summary>Ten rows with x stuck at 8 (Anscombe 1973, set 4 without its x = 19 row), as PairChecker records it.</summary>
    private static RunRecord ConstantXRun(long id, double hours)
    {
        var points = new PairedSample([.. Enumerable.Repeat(8.0, 10)], [6.58, 5.76, 7.71, 8.84, 8.47, 7.04, 5.25, 5.56, 7.91, 6.89]);
        var started = T0.AddHours(hours);
        return new RunRecord(id, "orders.amount_vs_tax", started, started.AddSeconds(1), RunStatus.Unmeasurable,
            "x is constant (8) in all 10 usable rows", MathNetProfile(points), [], null, points, "all");
    }

    [Fact]
    public void FirstRuns_UnmeasurableRunsWithPoints_AreNotCountedNorPooled()
    {
        var plan = BaselinePolicySelector.Plan(FirstTwo, null, T0.AddHours(10));
        var history = new List<RunRecord> { ConstantXRun(1, 0), LineRun(2, 1, 10), ConstantXRun(3, 2) };

        // Only one measurable run so far: no baseline, although three runs hold points.
        Assert.Null(BaselinePolicySelector.Build("p", FirstTwo, plan, history, null, T0.AddHours(10), MathNetProfile));

        history.Add(LineRun(4, 3, 10, offset: 10));
        var baseline = BaselinePolicySelector.Build("p", FirstTwo, plan, history, null, T0.AddHours(10), MathNetProfile)!;

        Assert.Equal(2, baseline.RunCount);
        Assert.Equal(20, baseline.Points.UsedCount);
        Assert.DoesNotContain(6.58, baseline.Points.Y);
        Assert.Equal(T0.AddHours(1), baseline.CoversFrom);
    }

    [Fact]
    public void Build_OnlyUnmeasurableRuns_NoBaseline()
    {
        Assert.Null(BaselineBuilder.Build("p", FirstTwo, [ConstantXRun(1, 0), ConstantXRun(2, 1)], T0, MathNetProfile));
    }

    [Fact]
    public void Accept_LatestRunUnmeasurable_TakesTheLatestMeasurableOne()
    {
        var good = LineRun(1, 0, 10, offset: 100);

        var accepted = BaselinePolicySelector.Accept("p", FirstTwo, [good, ConstantXRun(2, 1)], T0.AddHours(2), MathNetProfile)!;

        Assert.Equal(good.Points!.X, accepted.Points.X);
    }
}
