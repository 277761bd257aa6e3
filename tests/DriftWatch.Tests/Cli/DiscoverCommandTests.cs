using DriftWatch.Cli;
using DriftWatch.Configuration;
using DriftWatch.Core.Discovery;
using DriftWatch.Core.Profiling;

namespace DriftWatch.Tests.Cli;

/// <summary>The parts of <c>discover</c> that need no database (the surveys themselves: IntegrationTests/Discovery).</summary>
public sealed class DiscoverCommandTests : IDisposable
{
    private readonly string _folder = Directory.CreateTempSubdirectory("dw-discover-").FullName;

    public void Dispose() => Directory.Delete(_folder, recursive: true);

    [Fact]
    public async Task Discover_DuckDbFilesOnlySource_IsSurveyed_AndAnUnknownTableExitsTwo()
    {
        var config = Path.Combine(_folder, "driftwatch.yaml");
        await File.WriteAllTextAsync(config, """
            sources:
              - name: lake
                kind: duckdb

            """);
        var run = await CliRun.Of("discover", "--config", config, "--source", "lake", "--table", "events");
        Assert.Equal(ExitCodes.UsageError, run.ExitCode);
        // A duckdb source without a database file reads files only: a plain name is no table of its empty database.
        Assert.Contains("no table or view events in source 'lake'.", run.Error, StringComparison.Ordinal);
        Assert.DoesNotContain("not supported", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Discover_Help_ShowsAnExample()
    {
        var run = await CliRun.Of("discover", "--help");
        Assert.Equal(0, run.ExitCode);
        Assert.Contains("Example: driftwatch discover --source warehouse --table parcels", run.Out, StringComparison.Ordinal);
        Assert.Contains("--max-columns", run.Out, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("orders", "net", "total")]
    [InlineData("sales.orders", "a$b", "_c")]
    [InlineData("t", "cccccccccccccccccccccccccccccccccccccccccccccccccccccccccccccc", "ddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddddd")]
    public void PairNames_PassTheLoadersRuleForNames(string table, string x, string y)
    {
        var taken = new HashSet<string>();
        Assert.Null(Identifiers.CheckName(PairNames.For(table, x, y, taken)));
        Assert.Null(Identifiers.CheckName(PairNames.For(table, x, y, taken)));
    }

    [Fact]
    public void Yaml_ColumnTheLoaderRefuses_IsNamedInACommentNotProposed()
    {
        var candidate = new Candidate("net", "gross total", 0.9, 100, 0.9, Shape.Linear, null, 100, 0);
        var yaml = DiscoverYaml.Block("warehouse", "orders", new DiscoveryResult([], [candidate], 1), new HashSet<string>(), header: true);

        Assert.DoesNotContain("- name:", yaml, StringComparison.Ordinal);
        Assert.Contains("# not proposed: 'gross total' is not a plain column name", yaml, StringComparison.Ordinal);
    }
}
