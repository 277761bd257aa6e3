using DriftWatch.Core.Baselines;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using static DriftWatch.Core.Tests.Baselines.BaselineTestRuns;

namespace DriftWatch.Core.Tests.Baselines;

public sealed class BaselinePolicySelectorTests
{
    private const string Pair = "orders.amount_vs_tax";

    private static StoredBaseline? PlanAndBuild(BaselinePolicy policy, StoredBaseline? existing, DateTimeOffset now, IReadOnlyList<RunRecord> history)
    {
        var plan = BaselinePolicySelector.Plan(policy, existing, now);
        return BaselinePolicySelector.Build(Pair, policy, plan, history, existing, now, MathNetProfile);
    }

    [Fact]
    public void FirstRuns_FewerThanN_NoBaseline_ThenPoolsExactlyTheFirstN()
    {
        var policy = new BaselinePolicy { Kind = BaselinePolicyKind.FirstRuns, FirstRuns = 3 };
        var history = new List<RunRecord> { LineRun(1, 0, 10), LineRun(2, 1, 10, status: RunStatus.Failed) };

        Assert.Null(PlanAndBuild(policy, null, T0.AddHours(2), history));

        history.Add(LineRun(3, 2, 10, offset: 10));
        history.Add(LineRun(4, 3, 10, offset: 20));
        history.Add(LineRun(5, 4, 10, offset: 30));
        var baseline = PlanAndBuild(policy, null, T0.AddHours(5), history)!;

        Assert.Equal(3, baseline.RunCount);
        Assert.Equal(T0, baseline.CoversFrom);
        Assert.Equal(T0.AddHours(3), baseline.CoversTo);
        Assert.Equal(30, baseline.Points.UsedCount);
        Assert.DoesNotContain(baseline.Points.X, x => x >= 30);
    }

    [Fact]
    public void FirstRuns_OnceBuilt_IsKept_UntilThePolicyChanges()
    {
        var policy = new BaselinePolicy { Kind = BaselinePolicyKind.FirstRuns, FirstRuns = 2 };
        var history = new List<RunRecord> { LineRun(1, 0, 10), LineRun(2, 1, 10, offset: 10), LineRun(3, 2, 10, offset: 20) };
        var built = PlanAndBuild(policy, null, T0.AddHours(3), history)!;

        Assert.Equal(BaselinePlanKind.KeepExisting, BaselinePolicySelector.Plan(policy, built, T0.AddDays(40)).Kind);
        Assert.Same(built, PlanAndBuild(policy, built, T0.AddDays(40), history));

        var changed = policy with { FirstRuns = 3 };
        var rebuilt = PlanAndBuild(changed, built, T0.AddDays(40), history)!;
        Assert.Equal(3, rebuilt.RunCount);
        Assert.Equal("first_runs: 3", rebuilt.PolicyText);
    }

    [Fact]
    public void Window_PoolsRunsInsideTheHalfOpenRange_AndStopsRebuildingOnceClosed()
    {
        var policy = new BaselinePolicy { Kind = BaselinePolicyKind.Window, From = T0.AddHours(1), To = T0.AddHours(3) };
        var history = Enumerable.Range(0, 5).Select(i => LineRun(i + 1, i, 10, offset: i * 10)).ToList();

        var whileOpen = PlanAndBuild(policy, null, T0.AddHours(2.5), history)!;
        Assert.Equal(BaselinePlanKind.Build, BaselinePolicySelector.Plan(policy, whileOpen, T0.AddHours(2.6)).Kind);

        var closed = PlanAndBuild(policy, whileOpen, T0.AddHours(4), history)!;
        Assert.Equal(2, closed.RunCount);
        Assert.Equal(T0.AddHours(1), closed.CoversFrom);
        Assert.Equal(T0.AddHours(2), closed.CoversTo);
        Assert.Equal(BaselinePlanKind.KeepExisting, BaselinePolicySelector.Plan(policy, closed, T0.AddHours(9)).Kind);
    }

    [Fact]
    public void Rolling_PoolsThePeriodOnly_AndSkipsRunsWithCriticalFindings()
    {
        var policy = new BaselinePolicy { Kind = BaselinePolicyKind.Rolling, RollingPeriod = TimeSpan.FromHours(10) };
        var history = Enumerable.Range(0, 20)
            .Select(i => LineRun(i + 1, i, 5, offset: i * 5, worst: i == 15 ? Severity.Critical : i == 16 ? Severity.Warning : null))
            .ToList();
        var now = T0.AddHours(19.5);

        var baseline = PlanAndBuild(policy, null, now, history)!;

        // [9.5 h, 19.5 h) holds the runs at hours 10..19; the one at hour 15 had a critical finding.
        Assert.Equal(9, baseline.RunCount);
        Assert.Equal(T0.AddHours(10), baseline.CoversFrom);
        Assert.Equal(T0.AddHours(19), baseline.CoversTo);
        Assert.DoesNotContain(baseline.Points.X, x => x is >= 75 and < 80);
        Assert.Contains(baseline.Points.X, x => x is >= 80 and < 85);
    }

    [Fact]
    public void Rolling_RefreshesAfterAThirtiethOfThePeriod_NotBefore()
    {
        var policy = new BaselinePolicy { Kind = BaselinePolicyKind.Rolling, RollingPeriod = TimeSpan.FromDays(30) };
        var history = Enumerable.Range(0, 10).Select(i => LineRun(i + 1, i, 5, offset: i * 5)).ToList();
        var now = T0.AddHours(10);
        var built = PlanAndBuild(policy, null, now, history)!;

        Assert.Equal(BaselinePlanKind.KeepExisting, BaselinePolicySelector.Plan(policy, built, now.AddHours(23)).Kind);
        Assert.Equal(BaselinePlanKind.Build, BaselinePolicySelector.Plan(policy, built, now.AddHours(24)).Kind);
    }

    [Fact]
    public void Rolling_AllRecentRunsCritical_KeepsTheStoredBaseline()
    {
        var policy = new BaselinePolicy { Kind = BaselinePolicyKind.Rolling, RollingPeriod = TimeSpan.FromHours(5) };
        var good = Enumerable.Range(0, 5).Select(i => LineRun(i + 1, i, 5, offset: i * 5)).ToList();
        var existing = PlanAndBuild(policy, null, T0.AddHours(5), good)!;
        var later = Enumerable.Range(10, 5).Select(i => LineRun(i + 1, i, 5, offset: i * 5, worst: Severity.Critical)).ToList();

        Assert.Same(existing, PlanAndBuild(policy, existing, T0.AddHours(15), [.. good, .. later]));
    }

    [Fact]
    public void Accept_TakesTheLatestSuccessfulRunWithPoints_AndFixesItUnderFirstRuns()
    {
        var policy = new BaselinePolicy { Kind = BaselinePolicyKind.FirstRuns, FirstRuns = 2 };
        var history = new List<RunRecord>
        {
            LineRun(1, 0, 10),
            LineRun(2, 1, 10, offset: 100),
            LineRun(3, 2, 10, status: RunStatus.Failed),
        };

        var accepted = BaselinePolicySelector.Accept(Pair, policy, history, T0.AddHours(3), MathNetProfile)!;

        Assert.True(accepted.Accepted);
        Assert.Equal(1, accepted.RunCount);
        Assert.Equal(history[1].Points!.X, accepted.Points.X);
        Assert.Equal("first_runs: 2", accepted.PolicyText);
        Assert.Equal(BaselinePlanKind.KeepExisting, BaselinePolicySelector.Plan(policy, accepted, T0.AddDays(9)).Kind);
        Assert.Null(BaselinePolicySelector.Accept(Pair, policy, [history[2]], T0, MathNetProfile));
    }

    [Fact]
    public void Rolling_AfterAccept_PoolsOnlyFromTheAcceptedRunOn_UntilThePeriodPassesIt()
    {
        var policy = new BaselinePolicy { Kind = BaselinePolicyKind.Rolling, RollingPeriod = TimeSpan.FromHours(10) };
        var history = Enumerable.Range(0, 8).Select(i => LineRun(i + 1, i, 5, offset: i * 5)).ToList();
        var accepted = BaselinePolicySelector.Accept(Pair, policy, history, T0.AddHours(7.5), MathNetProfile)!;
        history.AddRange(Enumerable.Range(8, 4).Select(i => LineRun(i + 1, i, 5, offset: i * 5)));

        var anchored = PlanAndBuild(policy, accepted, T0.AddHours(11.5), history)!;
        Assert.Equal(T0.AddHours(7), anchored.CoversFrom);
        Assert.Equal(5, anchored.RunCount);
        Assert.True(anchored.Accepted);

        var plain = BaselinePolicySelector.Plan(policy, anchored, T0.AddHours(30));
        Assert.Equal(T0.AddHours(20), plain.From);
        Assert.False(plain.Accepted);
    }
}
