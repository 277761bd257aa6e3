using System.CommandLine;
using System.CommandLine.Invocation;
using System.CommandLine.Parsing;
using DriftWatch.Output;

namespace DriftWatch.Cli;

/// <summary>
/// The command line. Each command lives in its own <c>Cli/&lt;Name&gt;Command.cs</c> with a
/// <c>static Command Create(CliConsole console)</c>; adding one is that file plus one line in
/// <see cref="BuildRoot"/>.
/// </summary>
internal static class CliApp
{
    public const string RootDescription =
        "DriftWatch watches relationships between numeric column pairs and reports when one becomes " +
        "suspiciously perfect, drifts or breaks. Findings are statistical signals, not proof.\n\n" +
        "Examples:\n" +
        "  driftwatch profile                                   profile the bundled sample\n" +
        "  driftwatch profile --csv today.csv --x hours --y units --baseline-csv last_month.csv";

    public static Task<int> RunAsync(string[] args, CancellationToken cancellationToken) =>
        RunAsync(args, CliConsole.Standard(), cancellationToken);

    public static async Task<int> RunAsync(string[] args, CliConsole console, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(args);
        ArgumentNullException.ThrowIfNull(console);

        var root = BuildRoot(console);
        var parsed = root.Parse(args);
        if (parsed.Action is ParseErrorAction)
        {
            // System.CommandLine would exit 1 on a parse error; 1 means "findings" here, so usage errors
            // are reported by us with exit code 2.
            foreach (var error in parsed.Errors)
            {
                console.WriteError(error.Message);
            }

            console.Error.WriteLine($"Run '{HelpHint(parsed)} --help' for usage.");
            return ExitCodes.UsageError;
        }

        var invocation = new InvocationConfiguration
        {
            Output = console.Out,
            Error = console.Error,
            // Exceptions reach the catch blocks below, so a usage problem is one line, not a stack trace.
            EnableDefaultExceptionHandler = false,
        };
        if (RunCommand.StopsOnItsOwn(parsed))
        {
            // The worker's host handles SIGTERM and Ctrl+C itself and decides how long a stop takes (the checks'
            // grace); left to the command line, the process would end two seconds after the signal, exit 143.
            invocation.ProcessTerminationTimeout = null;
        }


        try
        {
            return await parsed.InvokeAsync(invocation, cancellationToken);
        }
        catch (CliUsageException ex)
        {
            console.WriteError(ex.Message);
            return ExitCodes.UsageError;
        }
        catch (Store.StoreUnavailableException ex)
        {
            console.WriteError(ex.Message + " (check store.connection; nothing was checked)");
            return ExitCodes.RunFailures;
        }
    }

    internal static RootCommand BuildRoot(CliConsole console)
    {
        var root = new RootCommand(RootDescription);
        root.Subcommands.Add(DemoCommand.Create(console));
        root.Subcommands.Add(ProfileCommand.Create(console));
        root.Subcommands.Add(RunCommand.Create(console));
        root.Subcommands.Add(CheckCommand.Create(console));
        root.Subcommands.Add(ValidateCommand.Create(console));
        root.Subcommands.Add(HistoryCommand.Create(console));
        root.Subcommands.Add(BaselineCommand.Create(console));
        root.Subcommands.Add(AlertsCommand.Create(console));
        root.Subcommands.Add(ReportCommand.Create(console));
        root.Subcommands.Add(DiscoverCommand.Create(console));
        return root;
    }

    private static string HelpHint(ParseResult parsed)
    {
        var names = new List<string>();
        for (var result = parsed.CommandResult; result is not null; result = result.Parent as CommandResult)
        {
            names.Insert(0, result.Command is RootCommand ? "driftwatch" : result.Command.Name);
        }

        return string.Join(' ', names);
    }
}
