using System.CommandLine;
using DriftWatch.Demo;
using DriftWatch.Output;

namespace DriftWatch.Cli;

/// <summary>
/// <c>driftwatch demo</c>: an invented container terminal's feed, 21 simulated days, five injected faults and a
/// control pair, checked through the production flow into a folder of results. No server needed.
/// </summary>
internal static class DemoCommand
{
    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);
        var days = new Option<int>("--days")
        {
            Description = $"Simulated days, 1 to {DemoOptions.MaxDays}; the faults start on days 8 to 19, so fewer days show fewer of them.",
            DefaultValueFactory = _ => TerminalScenario.DefaultDays,
            HelpName = "N",
        };
        var output = new Option<string>("--out", "-o")
        {
            Description = "The output folder. It is deleted and recreated, but only if a previous demo made it (or it is empty); any other folder is refused.",
            DefaultValueFactory = _ => DemoFolder.DefaultPath,
            HelpName = "DIR",
        };
        var postgres = new Option<string?>("--postgres")
        {
            Description = $"Load the scenario into schema '{PostgresScenarioDatabase.Schema}' of this PostgreSQL database (an Npgsql connection string) " +
                "and watch it with a postgres source, instead of a SQLite file in the output folder.",
            HelpName = "CONN",
        };
        var serve = new Option<bool>("--serve")
        {
            Description = "Afterwards, serve the dashboard on 127.0.0.1 to browse the result (Ctrl+C stops it).",
        };
        var verbose = VerboseOption.Create();
        verbose.Description = "Log each step of the flow (information level) to stderr; by default only errors are logged, the day lines say the rest.";
        var command = new Command(
            "demo",
            $"Run an embedded scenario end to end: {TerminalScenario.TerminalName}, an invented inland container terminal whose daily " +
            "feed DriftWatch watches for 21 simulated days. One pair is a control; the others break on purpose (a column copied by a " +
            "join, a switch to miles, shuffled rows, sentinel values, congestion, a renamed table). The demo writes the pipeline " +
            "database, a configuration, the store, alert mails (.eml) and a report into the output folder, prints one line per day " +
            "and a summary. Exit code 0: every fault caught and the control pair silent; 1: otherwise; 2: the folder or database " +
            "could not be used.\n\n" +
            "Example: driftwatch demo --out /tmp/demo --serve")
        {
            days, output, postgres, serve, verbose,
        };
        command.SetAction(async (parse, ct) =>
        {
            var options = new DemoOptions(parse.GetValue(output)!, parse.GetValue(days), parse.GetValue(postgres), parse.GetValue(verbose));
            DemoRun run;
            try
            {
                run = await new DemoRunner(console).RunAsync(options, ct);
            }
            catch (DemoException ex)
            {
                console.WriteError(ex.Message);
                return ExitCodes.UsageError;
            }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
            {
                console.WriteError($"cannot write the demo's output to {options.Out}: {ex.Message}");
                return ExitCodes.UsageError;
            }

            console.Out.WriteLine();
            DemoReport.Render(console.Out, run);
            if (parse.GetValue(serve))
            {
                try
                {
                    await DemoDashboard.ServeAsync(run, console, ct);
                }
                catch (DemoException ex)
                {
                    console.WriteError(ex.Message);
                    return ExitCodes.UsageError;
                }
            }

            return run.Outcome.ExitCode;
        });
        return command;
    }
}
