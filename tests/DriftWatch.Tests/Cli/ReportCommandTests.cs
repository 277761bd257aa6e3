using DriftWatch.Tests.Dashboard;

namespace DriftWatch.Tests.Cli;

[Collection(DashboardScenarioGroup.Name)]
public sealed class ReportCommandTests(DashboardFixture fixture) : IDisposable
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "driftwatch-reportcmd-" + Guid.NewGuid().ToString("N")[..10]);

    private string WriteConfig(string storePath)
    {
        Directory.CreateDirectory(_dir);
        var path = Path.Combine(_dir, "driftwatch.yaml");
        File.WriteAllText(path, $"""
            sources:
              - name: shop_db
                kind: sqlite
                connection: shop.db
            store:
              kind: sqlite
              connection: {storePath}
            pairs:
              - name: {DashboardScenario.Healthy}
                source: shop_db
                table: sales.orders
                x: item_count
                y: order_total
            """);
        return path;
    }

    [Fact]
    public async Task Report_WritesEveryPairOfTheStore_AndSaysWhere()
    {
        var config = WriteConfig(fixture.Scenario.StorePath);
        var output = Path.Combine(_dir, "out");

        var run = await CliRun.Of("report", "--config", config, "--out", output);

        Assert.Equal(0, run.ExitCode);
        // One configured pair plus four more the store still has history for, the overview and the alerts page.
        Assert.Contains("wrote 7 pages to " + Path.GetFullPath(output), run.Out, StringComparison.Ordinal);
        Assert.True(File.Exists(Path.Combine(output, "index.html")));
        Assert.True(File.Exists(Path.Combine(output, "pairs", DashboardScenario.Healthy + ".html")));
        Assert.Contains("sampled data values", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Report_OnePair_WritesThreePages()
    {
        var run = await CliRun.Of("report", "--config", WriteConfig(fixture.Scenario.StorePath), "--out", Path.Combine(_dir, "one"), "--pair", DashboardScenario.Perfect);

        Assert.Equal(0, run.ExitCode);
        Assert.Contains("wrote 3 pages", run.Out, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Report_UnknownPair_IsAUsageError()
    {
        var run = await CliRun.Of("report", "--config", WriteConfig(fixture.Scenario.StorePath), "--out", Path.Combine(_dir, "x"), "--pair", "nope");

        Assert.Equal(2, run.ExitCode);
        Assert.Contains("error: no pair named 'nope'", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Report_StoreFileMissing_IsAUsageError_AndCreatesNothing()
    {
        var missing = Path.Combine(_dir, "never", "driftwatch.db");

        var run = await CliRun.Of("report", "--config", WriteConfig(missing), "--out", Path.Combine(_dir, "x"));

        Assert.Equal(2, run.ExitCode);
        Assert.Contains("does not exist", run.Error, StringComparison.Ordinal);
        Assert.False(File.Exists(missing));
    }

    [Fact]
    public async Task Report_BadConfiguration_NamesFileAndLine()
    {
        Directory.CreateDirectory(_dir);
        var path = Path.Combine(_dir, "bad.yaml");
        File.WriteAllText(path, "pairs:\n  - name: x\n    sorce: shop\n");

        var run = await CliRun.Of("report", "--config", path, "--out", Path.Combine(_dir, "x"));

        Assert.Equal(2, run.ExitCode);
        Assert.Contains("bad.yaml:", run.Error, StringComparison.Ordinal);
    }

    public void Dispose()
    {
        if (Directory.Exists(_dir))
        {
            Directory.Delete(_dir, recursive: true);
        }
    }
}
