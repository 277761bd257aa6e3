using DriftWatch.Core.Configuration;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using Serilog;
using Serilog.Events;

namespace DriftWatch.Hosting;

/// <summary>
/// The flow's services for a one-shot process (the CLI's commands, the demo), with logs on stderr, the store migrated.
/// The worker builds the same services into its host (<see cref="WorkerHost"/>); this is the only other start-up.
/// </summary>
internal static class OneShotServices
{
    /// <summary>For a command: warnings only unless --verbose.</summary>
    public static Task<ServiceProvider> StartAsync(DriftWatchConfig config, bool verbose, CancellationToken cancellationToken, TimeProvider? time = null) =>
        StartAsync(config, verbose ? LogEventLevel.Information : LogEventLevel.Warning, cancellationToken, time);

    public static async Task<ServiceProvider> StartAsync(DriftWatchConfig config, LogEventLevel level, CancellationToken cancellationToken, TimeProvider? time = null)
    {
        ArgumentNullException.ThrowIfNull(config);
        var logger = LoggingSetup.Create(config.Logging, level);
        var services = new ServiceCollection()
            .AddLogging(logging => logging.ClearProviders().AddSerilog(logger, dispose: true))
            .AddDriftWatch(config, time ?? TimeProvider.System)
            .BuildServiceProvider();
        try
        {
            await services.MigrateStoreAsync(cancellationToken);
            return services;
        }
        catch
        {
            await services.DisposeAsync();
            throw;
        }
    }
}
