using DriftWatch.Cli;
using DriftWatch.Output;

namespace DriftWatch.Tests.Cli;

/// <summary>Runs the command line in-process with captured output.</summary>
internal sealed record CliRun(int ExitCode, string Out, string Error)
{
    public static async Task<CliRun> Of(params string[] args)
    {
        using var output = new StringWriter();
        using var error = new StringWriter();
        var exitCode = await CliApp.RunAsync(args, CliConsole.ForWriters(output, error), CancellationToken.None);
        return new CliRun(exitCode, output.ToString(), error.ToString());
    }
}
