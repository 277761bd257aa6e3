using DriftWatch.Dashboard;
using DriftWatch.Output;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Demo;

/// <summary>
/// <c>demo --serve</c>: the dashboard over the demo's store on the configured loopback address until Ctrl+C,
/// with the clock standing at the last simulated check (the runs are dated in the scenario's November).
/// </summary>
internal static class DemoDashboard
{
    public static async Task ServeAsync(DemoRun run, CliConsole console, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(run);
        ArgumentNullException.ThrowIfNull(console);
        var database = StoreFactory.CreateDatabase(run.Config.Store);
        try
        {
            var options = new DashboardServerOptions(run.Config, database, StoreFactory.CreateHistoryStore(database, run.Config.Store), new AlertStore(database))
            {
                Time = new DemoClock(run.LastCheck),
                Logging = logging => logging.SetMinimumLevel(LogLevel.Warning).AddConsole(),
            };
            var endPoint = DashboardBinding.EndPoint(run.Config.Dashboard);
            if (DashboardBinding.Probe(endPoint) is { } problem)
            {
                throw new DemoException(problem);
            }

            DashboardServer server;
            try
            {
                server = await DashboardServer.StartAsync(options, cancellationToken);
            }
            catch (Exception ex) when (DashboardBinding.Failure(endPoint, ex) is { } failure)
            {
                // Taken between the probe and the start.
                throw new DemoException(failure, ex);
            }

            await using (server)
            {
                console.Out.WriteLine();
                console.Out.WriteLine($"Dashboard at {server.Address} (the demo's store, as of the last simulated day). Ctrl+C stops it.");
                try
                {
                    await Task.Delay(Timeout.Infinite, cancellationToken);
                }
                catch (OperationCanceledException) when (cancellationToken.IsCancellationRequested)
                {
                    console.Out.WriteLine("Dashboard stopped.");
                }
            }
        }
        finally
        {
            if (database is IAsyncDisposable disposable)
            {
                await disposable.DisposeAsync();
            }
        }
    }
}
