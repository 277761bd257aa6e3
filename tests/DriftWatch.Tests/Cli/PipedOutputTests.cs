using System.Diagnostics;
using System.Text.RegularExpressions;

namespace DriftWatch.Tests.Cli;

/// <summary>
/// Tables written into a pipe, as a script reads them: the real executable started with its standard output
/// redirected (so Console.IsOutputRedirected is true, as under "driftwatch history … > file" or "| grep").
/// Every table row must stay on one line with names and timestamps whole.
/// </summary>
public sealed partial class PipedOutputTests : IDisposable
{
    private readonly AnscombeWorkspace _workspace = new();

    [Fact]
    public async Task History_IntoAPipe_KeepsEachRowOnOneLineWithTheFullNameAndDate()
    {
        Assert.Equal(0, (await CliRun.Of("check", "--config", _workspace.ConfigPath)).ExitCode);
        Assert.Equal(0, (await CliRun.Of("check", "--config", _workspace.ConfigPath)).ExitCode);

        var (exit, output) = await RunPipedAsync("history", AnscombeWorkspace.PairName, "--config", _workspace.ConfigPath);

        Assert.Equal(0, exit);
        var lines = output.Split('\n');
        // The title names the whole pair, x before y, on one line (an 80-column layout cut it mid-word).
        Assert.Contains(lines, l => l.Contains(AnscombeWorkspace.PairName + ": pallets_loaded_by_evening_crew vs shipments_total_of_the_day", StringComparison.Ordinal));
        // One line per run, each with a whole timestamp and the status word the JSON uses.
        var rows = lines.Where(l => Timestamp().IsMatch(l)).ToArray();
        Assert.Equal(2, rows.Length);
        Assert.All(rows, r => Assert.Contains("succeeded", r, StringComparison.Ordinal));
        // No line holds a date cut in two ("2026-12-0" then "2" on the next line).
        Assert.DoesNotContain(lines, l => PartialDate().IsMatch(l) && !Timestamp().IsMatch(l));
    }

    [Fact]
    public async Task Check_IntoAPipe_PrintsTheLongPairNameWholeInItsRow()
    {
        var (exit, output) = await RunPipedAsync("check", "--config", _workspace.ConfigPath);

        Assert.Equal(0, exit);
        var row = Assert.Single(output.Split('\n'), l => l.Contains(AnscombeWorkspace.PairName, StringComparison.Ordinal) && l.Contains("succeeded", StringComparison.Ordinal));
        // Pearson's r of Anscombe's set I is 0.816 (Anscombe 1973), printed in the same row.
        Assert.Contains("0.8164", row, StringComparison.Ordinal);
        Assert.True(row.Length > 80, "the row is wider than a terminal's default 80 columns and was not wrapped");
    }

    private static async Task<(int Exit, string Output)> RunPipedAsync(params string[] args)
    {
        var info = new ProcessStartInfo("dotnet")
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        info.ArgumentList.Add("exec");
        info.ArgumentList.Add(Path.Combine(AppContext.BaseDirectory, "driftwatch.dll"));
        foreach (var arg in args)
        {
            info.ArgumentList.Add(arg);
        }

        // A terminal width in the environment must not matter when the output is a pipe.
        info.Environment["COLUMNS"] = "80";
        using var process = Process.Start(info) ?? throw new InvalidOperationException("could not start dotnet");
        var stdout = process.StandardOutput.ReadToEndAsync();
        var stderr = process.StandardError.ReadToEndAsync();
        await process.WaitForExitAsync();
        var output = await stdout;
        Assert.True(process.ExitCode <= 1, "driftwatch failed: " + await stderr);
        return (process.ExitCode, output);
    }

    public void Dispose() => _workspace.Dispose();

    [GeneratedRegex(@"\d{4}-\d{2}-\d{2} \d{2}:\d{2}:\d{2}")]
    private static partial Regex Timestamp();

    [GeneratedRegex(@"\d{4}-\d{2}-\d")]
    private static partial Regex PartialDate();
}
