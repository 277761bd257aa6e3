using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Tests.Dashboard.Pages;

/// <summary>The pair page says where the latest run's window ended and, for a back-dated run, when it was made.</summary>
public sealed class WindowEndPageTests
{
    // Anscombe (1973), set 1: eleven rows, r = 0.816 (published data; measurable at the default 10 usable rows).
    private static readonly PairedSample Anscombe1 = new(
        [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5],
        [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68]);

    [Fact]
    public async Task PairPage_LatestRunBackDated_SaysWhereItsWindowEndedAndWhenItWasMade()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        var pair = DashboardScenario.Young;
        var asOf = DashboardScenario.Start.AddHours(3);
        var profile = Profiler.Profile(Anscombe1, Thresholds.Default);
        await scenario.History.RecordRunAsync(
            new NewRun(pair, asOf, asOf.AddSeconds(1), RunStatus.Succeeded, null, profile, [], null, Anscombe1, "all")
            {
                WindowEnd = asOf.AddMinutes(-42).AddSeconds(-7),
                BackDatedAt = asOf.AddDays(2),
            },
            CancellationToken.None);

        await using var host = await DashboardHost.StartAsync(scenario);
        var (status, page) = await host.GetAsync("/pairs/" + pair);

        Assert.Equal(200, status);
        var ended = asOf.AddMinutes(-42).AddSeconds(-7).UtcDateTime.ToString("yyyy-MM-dd HH:mm:ss", System.Globalization.CultureInfo.InvariantCulture);
        var made = asOf.AddDays(2).UtcDateTime.ToString("yyyy-MM-dd HH:mm:ss", System.Globalization.CultureInfo.InvariantCulture);
        Assert.Contains($"Window ended at {ended} UTC.", page, StringComparison.Ordinal);
        Assert.Contains($"Back-dated run: checked on {made} UTC as of", page, StringComparison.Ordinal);
    }
}
