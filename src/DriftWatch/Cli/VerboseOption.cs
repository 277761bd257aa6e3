using System.CommandLine;

namespace DriftWatch.Cli;

internal static class VerboseOption
{
    public static Option<bool> Create() => new("--verbose", "-v")
    {
        Description = "Log each step (information level) to stderr; by default only warnings and errors are logged.",
    };
}
