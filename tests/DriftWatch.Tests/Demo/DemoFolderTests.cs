using DriftWatch.Demo;
using DriftWatch.Tests.Cli;
using DriftWatch.Tests.Configuration;

namespace DriftWatch.Tests.Demo;

public sealed class DemoFolderTests
{
    [Fact]
    public async Task Demo_FolderThatIsNotADemosOutput_IsRefusedAndLeftAlone()
    {
        using var folder = new TempDirectory();
        var precious = folder.Write("quarterly.csv", "a,b\n1,2\n");

        var run = await CliRun.Of("demo", "--out", folder.Path, "--days", "1");

        Assert.Equal(2, run.ExitCode);
        Assert.Contains("does not look like a previous demo's output", run.Error, StringComparison.Ordinal);
        Assert.Equal("a,b\n1,2\n", File.ReadAllText(precious));
        Assert.False(File.Exists(Path.Combine(folder.Path, DemoFolder.MarkerFile)));
    }

    [Fact]
    public void Prepare_PreviousDemoOutput_IsEmptiedAndMarkedAgain()
    {
        using var folder = new TempDirectory();
        folder.Write(DemoFolder.MarkerFile, "old");
        var stale = folder.Write("stale.eml", "old mail");

        var prepared = DemoFolder.Prepare(folder.Path);

        Assert.Equal(Path.GetFullPath(folder.Path), prepared);
        Assert.False(File.Exists(stale));
        Assert.Contains("driftwatch demo", File.ReadAllText(Path.Combine(folder.Path, DemoFolder.MarkerFile)), StringComparison.Ordinal);
    }

    [Fact]
    public async Task Demo_DaysOutOfRange_IsAUsageError()
    {
        using var folder = new TempDirectory();

        var run = await CliRun.Of("demo", "--out", Path.Combine(folder.Path, "out"), "--days", "0");

        Assert.Equal(2, run.ExitCode);
        Assert.Contains("--days must be between 1 and 365, was 0", run.Error, StringComparison.Ordinal);
    }

    [Fact]
    public async Task Demo_TenDays_CountsLaterFaultsAsNotReachedAndPasses()
    {
        using var folder = new TempDirectory();

        var run = await CliRun.Of("demo", "--out", Path.Combine(folder.Path, "out"), "--days", "10");

        Assert.Equal(0, run.ExitCode);
        Assert.Contains("day 10  2026-11-10", run.Out, StringComparison.Ordinal);
        Assert.DoesNotContain("day 11", run.Out, StringComparison.Ordinal);
        Assert.Contains("not reached", run.Out, StringComparison.Ordinal);
    }
}
