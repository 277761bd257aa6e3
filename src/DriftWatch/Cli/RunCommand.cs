using System.CommandLine;
using DriftWatch.Hosting;
using Microsoft.Extensions.Hosting;

namespace DriftWatch.Cli;

/// <summary><c>driftwatch run</c>: the hosted worker, until SIGTERM or Ctrl+C.</summary>
internal static class RunCommand
{
    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);
        var config = ConfigOption.Create();
        var command = new Command(
            "run",
            "Run the worker: check every pair on its cron schedule, evaluate alerts, deliver email and serve the dashboard. " +
            "Stops cleanly on SIGTERM or Ctrl+C (running checks get a grace period to finish).")
        {
            config,
        };
        command.SetAction(async (parse, ct) =>
        {
            var loaded = ConfigOption.Load(parse.GetValue(config), console);
            if (loaded is null)
            {
                return ExitCodes.UsageError;
            }

            await using var app = WorkerHost.Build(loaded);
            await app.StartAsync(ct);
            await app.WaitForShutdownAsync(ct);
            return ExitCodes.Healthy;
        });
        return command;
    }
}
