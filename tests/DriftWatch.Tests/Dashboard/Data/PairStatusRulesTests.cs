using DriftWatch.Core.Alerting;
using DriftWatch.Core.Findings;
using DriftWatch.Core.History;
using DriftWatch.Dashboard.Data;

namespace DriftWatch.Tests.Dashboard.Data;

public sealed class PairStatusRulesTests
{
    private static readonly DateTimeOffset At = new(2026, 12, 1, 0, 0, 0, TimeSpan.Zero);

    [Fact]
    public void Derive_CoversEveryState()
    {
        var ok = Run(RunStatus.Succeeded);
        var failed = Run(RunStatus.Failed);

        Assert.Equal(PairStatus.NoRuns, PairStatusRules.Derive(null, [], hasBaseline: false));
        Assert.Equal(PairStatus.NoBaseline, PairStatusRules.Derive(ok, [], hasBaseline: false));
        Assert.Equal(PairStatus.Healthy, PairStatusRules.Derive(ok, [], hasBaseline: true));
        Assert.Equal(PairStatus.Watching, PairStatusRules.Derive(ok, [Alert(Severity.Warning, AlertStatus.Watching)], hasBaseline: true));
        Assert.Equal(PairStatus.Confirmed, PairStatusRules.Derive(ok, [Alert(Severity.Warning, AlertStatus.Watching), Alert(Severity.Critical, AlertStatus.Confirmed)], hasBaseline: true));
        // A pair can have an alert confirmed on its own profile before it has a baseline.
        Assert.Equal(PairStatus.Confirmed, PairStatusRules.Derive(ok, [Alert(Severity.Warning, AlertStatus.Confirmed)], hasBaseline: false));
        // A failed latest check outranks what the older runs said.
        Assert.Equal(PairStatus.Failing, PairStatusRules.Derive(failed, [Alert(Severity.Critical, AlertStatus.Confirmed)], hasBaseline: true));
        // So does an unmeasurable one: nothing was measured, with or without a baseline, whatever is open.
        var empty = Run(RunStatus.Unmeasurable);
        Assert.Equal(PairStatus.Unmeasurable, PairStatusRules.Derive(empty, [Alert(Severity.Critical, AlertStatus.Confirmed)], hasBaseline: true));
        Assert.Equal(PairStatus.Unmeasurable, PairStatusRules.Derive(empty, [], hasBaseline: false));
    }

    [Fact]
    public void Derive_InfoAlertsStayWatchingForEver_AndDoNotMakeAPairWatching()
    {
        Assert.Equal(PairStatus.Healthy, PairStatusRules.Derive(Run(RunStatus.Succeeded), [Alert(Severity.Info, AlertStatus.Watching)], hasBaseline: true));
    }

    [Fact]
    public void Statuses_AreOrderedWorstFirst()
    {
        Assert.Equal(
            [PairStatus.Confirmed, PairStatus.Failing, PairStatus.Unmeasurable, PairStatus.Watching, PairStatus.NoBaseline, PairStatus.NoRuns, PairStatus.Healthy],
            Enum.GetValues<PairStatus>().Order());
        Assert.Equal("no baseline", PairStatusRules.Label(PairStatus.NoBaseline));
        Assert.Equal("unmeasurable", PairStatusRules.Label(PairStatus.Unmeasurable));
    }

    private static RunRecord Run(RunStatus status) => new(1, "p", At, At, status, null, null, [], null, null, null);

    private static AlertState Alert(Severity severity, AlertStatus status) =>
        new(1, "p", FindingKind.Outliers, severity, status, 1, At, At, status == AlertStatus.Confirmed ? At : null, null, null, null, "m", 1);
}
