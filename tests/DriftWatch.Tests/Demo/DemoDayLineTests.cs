using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.Demo;
using DriftWatch.Hosting;
using DriftWatch.Monitoring;

namespace DriftWatch.Tests.Demo;

/// <summary>The demo's line per day names an unmeasurable check as such (with its reason once), never as checked fine.</summary>
public sealed class DemoDayLineTests
{
    private static readonly DateTimeOffset At = TerminalScenario.CheckTimeOf(9);

    private static PairCheckResult Result(string pair, RunStatus status, string? error) =>
        new(new PairConfig { Name = pair, Source = "s", Table = "t", X = "x", Y = "y" }, 1, status, error, null, [], At, At, HasBaseline: true);

    [Fact]
    public void Describe_UnmeasurableCheck_NamedOnItsOwnWithTheReasonOnce()
    {
        var line = new DemoDayLine();
        const string Reason = "No rows in the window: there is nothing to measure of kwh against units.";
        CheckPassResult Pass() => new([Result("reefers", RunStatus.Unmeasurable, Reason), Result("cranes", RunStatus.Succeeded, null)], [], DispatchResult.None);

        var first = line.Describe(9, Pass());
        var second = line.Describe(10, Pass());

        Assert.Contains("1 unmeasurable: reefers", first[0], StringComparison.Ordinal);
        Assert.DoesNotContain("failed", first[0], StringComparison.Ordinal);
        Assert.Equal("        reefers: " + Reason, first[1]);
        Assert.Contains("1 unmeasurable: reefers", second[0], StringComparison.Ordinal);
        Assert.DoesNotContain(second, l => l.Contains(Reason, StringComparison.Ordinal));
    }
}
