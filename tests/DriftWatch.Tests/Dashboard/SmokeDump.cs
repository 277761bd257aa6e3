namespace DriftWatch.Tests.Dashboard;

public sealed class SmokeDump
{
    [Fact]
    public async Task Dump()
    {
        await using var scenario = await DashboardScenario.CreateAsync(hostile: true);
        await using var host = await DashboardHost.StartAsync(scenario);
        foreach (var (path, file) in new[] { ("/", "overview"), ("/pairs/" + Uri.EscapeDataString(DashboardScenario.Perfect), "pair"), ("/alerts", "alerts"), ("/api/pairs", "api"), ("/metrics", "metrics"), ("/healthz", "healthz"), ("/pairs/" + Uri.EscapeDataString(DashboardScenario.Hostile), "hostile") })
        {
            var (status, body) = await host.GetAsync(path);
            File.WriteAllText($"/tmp/dash-{file}.html", status + "\n" + body);
        }

        await DriftWatch.Dashboard.Export.StaticReport.WriteAsync(scenario.Config, scenario.History, scenario.Alerts, "/tmp/dash-static", null, DashboardScenario.Clock, CancellationToken.None);
        File.WriteAllLines("/tmp/dash-logs.txt", host.Logs.Lines);
    }
}
