using DriftWatch.Core.History;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Tests.Dashboard.Pages;

public sealed class PairPagingTests
{
    [Fact]
    public async Task PairPage_55Runs_PagesBy50_NewestFirst_AndClampsOutOfRangePages()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        var start = DashboardScenario.Start;
        for (var i = 0; i < 55; i++)
        {
            // Run i has i + 3 points on the line y = 2x: its n column tells the rows apart.
            var xs = Enumerable.Range(0, i + 3).Select(v => (double)v).ToArray();
            var sample = new PairedSample(xs, [.. xs.Select(v => 2 * v + (v % 2 == 0 ? 0.5 : -0.5))]);
            await scenario.History.RecordRunAsync(
                new NewRun(DashboardScenario.Healthy, start.AddHours(i), start.AddHours(i).AddSeconds(1), RunStatus.Succeeded, null, Profiler.Profile(sample, Thresholds.Default), [], null, null),
                CancellationToken.None);
        }

        await using var host = await DashboardHost.StartAsync(scenario);

        var (_, first) = await host.GetAsync("/pairs/" + DashboardScenario.Healthy);
        Assert.Equal(50, PageHtml.Count(first, "<tr data-run-id="));
        Assert.Contains("runs 1–50 of 55, newest first", first, StringComparison.Ordinal);
        Assert.Contains("href=\"/pairs/orders.total_vs_items?page=2#history\" rel=\"next\"", first, StringComparison.Ordinal);
        Assert.Contains("<td class=\"num\">57</td>", first, StringComparison.Ordinal); // newest: 54 + 3 rows

        var (_, second) = await host.GetAsync("/pairs/" + DashboardScenario.Healthy + "?page=2");
        Assert.Equal(5, PageHtml.Count(second, "<tr data-run-id="));
        Assert.Contains("runs 51–55 of 55", second, StringComparison.Ordinal);
        Assert.Contains("rel=\"prev\"", second, StringComparison.Ordinal);
        Assert.DoesNotContain("rel=\"next\"", second, StringComparison.Ordinal);
        Assert.Contains("<td class=\"num\">3</td>", second, StringComparison.Ordinal); // oldest

        var (status, beyond) = await host.GetAsync("/pairs/" + DashboardScenario.Healthy + "?page=99");
        Assert.Equal(200, status);
        Assert.Contains("page 2 of 2", beyond, StringComparison.Ordinal);
    }
}
