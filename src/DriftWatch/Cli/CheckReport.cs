using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Monitoring;
using DriftWatch.Output;

namespace DriftWatch.Cli;

/// <summary>What <c>check</c> prints at the end, in the format asked for, to standard output or to <c>--output</c>.</summary>
internal static class CheckReport
{
    public static void Write(
        CliConsole console, DriftWatchConfig config, IReadOnlyList<PairCheckResult> results, int exitCode,
        CheckFormat format, Severity failAt, FileInfo? output)
    {
        ArgumentNullException.ThrowIfNull(console);
        ArgumentNullException.ThrowIfNull(config);
        var tally = new CheckTally(results, failAt, exitCode);
        if (output is null)
        {
            if (format == CheckFormat.Table)
            {
                CheckOutput.RenderTable(console.Ansi, results);
            }
            else
            {
                console.Out.Write(Text(config, tally, format));
            }

            return;
        }

        ReportFile.Write(output, Text(config, tally, format));
        console.Error.WriteLine(
            $"Wrote the {Word(format)} report to {output.FullName}: {tally.Results.Count} pair(s), {tally.Passing} passing, " +
            $"{tally.Failing} failing, {tally.NotMeasured} not measured.");
    }

    private static string Text(DriftWatchConfig config, CheckTally tally, CheckFormat format) => format switch
    {
        CheckFormat.Json => JsonContract.Serialize(CheckOutput.ToJson(tally.Results, tally.ExitCode)) + "\n",
        CheckFormat.Junit => CheckJunit.Write(tally) + "\n",
        CheckFormat.Markdown => CheckMarkdown.Write(tally, config.Alerting.PublicUrl),
        _ => Table(tally.Results),
    };

    /// <summary>The table as a pipe gets it: plain text, laid out wide enough that no row wraps.</summary>
    private static string Table(IReadOnlyList<PairCheckResult> results)
    {
        using var text = new StringWriter();
        CheckOutput.RenderTable(CliConsole.ForWriters(text, TextWriter.Null, CliConsole.PipedWidth).Ansi, results);
        return text.ToString();
    }

    private static string Word(CheckFormat format) => format switch
    {
        CheckFormat.Json => "JSON",
        CheckFormat.Junit => "JUnit XML",
        CheckFormat.Markdown => "Markdown",
        _ => "table",
    };
}
