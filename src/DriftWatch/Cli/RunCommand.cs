using System.CommandLine;
using System.CommandLine.Parsing;
using DriftWatch.Dashboard;
using DriftWatch.Hosting;
using DriftWatch.Output;
using Microsoft.AspNetCore.Builder;
using Microsoft.Extensions.Hosting;

namespace DriftWatch.Cli;

/// <summary><c>driftwatch run</c>: the hosted worker, until SIGTERM or Ctrl+C.</summary>
internal static class RunCommand
{
    public const string Name = "run";

    public static Command Create(CliConsole console)
    {
        ArgumentNullException.ThrowIfNull(console);
        var config = ConfigOption.Create();
        var command = new Command(
            Name,
            "Run the worker: check every pair on its cron schedule, evaluate alerts, deliver email and serve the dashboard. " +
            "Stops cleanly on SIGTERM or Ctrl+C (running checks get a grace period to finish, worker.stop_grace).")
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

            // A taken port or an address not on this machine stops the start here, before any check is scheduled.
            var endPoint = WorkerHost.ListenEndPoint(loaded);
            if (DashboardBinding.Probe(endPoint) is { } problem)
            {
                console.WriteError(problem);
                return ExitCodes.UsageError;
            }

            await using var app = WorkerHost.Build(loaded);
            if (await StartAsync(app, endPoint, console, ct) is { } stoppedWith)
            {
                return stoppedWith;
            }

            // The host's lifetime handles SIGTERM and Ctrl+C (see StopsOnItsOwn): this returns once it has
            // stopped, after the checks' grace.
            await app.WaitForShutdownAsync(ct);
            return ExitCodes.Healthy;
        });
        return command;
    }

    /// <summary>
    /// True for <c>run</c>: it stops through its host, which gives running checks their grace; the command line's
    /// own handling of SIGTERM would end the process two seconds after the signal.
    /// </summary>
    public static bool StopsOnItsOwn(ParseResult parsed)
    {
        ArgumentNullException.ThrowIfNull(parsed);
        return parsed.CommandResult.Command.Name == Name && parsed.CommandResult.Parent is CommandResult { Command: RootCommand };
    }

    /// <summary>Null once the worker has started; else the exit code of a start that ended early.</summary>
    private static async Task<int?> StartAsync(WebApplication app, System.Net.IPEndPoint endPoint, CliConsole console, CancellationToken cancellationToken)
    {
        try
        {
            await app.StartAsync(cancellationToken);
            return null;
        }
        catch (Exception ex) when (DashboardBinding.Failure(endPoint, ex) is not null)
        {
            // Taken between the probe and the start: the same one line, and whatever had started is stopped.
            console.WriteError(DashboardBinding.Failure(endPoint, ex)!);
            using var stop = new CancellationTokenSource(TimeSpan.FromSeconds(5));
            await app.StopAsync(stop.Token);
            return ExitCodes.UsageError;
        }
        catch (OperationCanceledException) when (cancellationToken.IsCancellationRequested || app.Lifetime.ApplicationStopping.IsCancellationRequested)
        {
            // SIGTERM or Ctrl+C while the services were starting: the host cancels the start. Stop what had started
            // (no check has run yet) and end as a stop after the start would, instead of with an unhandled exception.
            using var stop = new CancellationTokenSource(TimeSpan.FromSeconds(10));
            await app.StopAsync(stop.Token);
            return ExitCodes.Healthy;
        }
    }
}
