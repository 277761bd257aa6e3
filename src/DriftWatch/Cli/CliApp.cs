using System.CommandLine;

namespace DriftWatch.Cli;

internal static class CliApp
{
    public static async Task<int> RunAsync(string[] args, CancellationToken cancellationToken)
    {
        var root = new RootCommand("DriftWatch watches relationships between column pairs and alerts when they change.");
        return await root.Parse(args).InvokeAsync(cancellationToken: cancellationToken);
    }
}
