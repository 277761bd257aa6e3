using DriftWatch.Core.Configuration;
using DriftWatch.Hosting;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using Serilog;
using Serilog.Events;

namespace DriftWatch.Hosting;

/// <summary>The flow's services for a one-shot command, with logs on stderr (warnings only unless --verbose).</summary>
internal static class CliServices
{
    public static async Task<ServiceProvider> StartAsync(DriftWatchConfig config, bool verbose, CancellationToken cancellationToken, TimeProvider? time = null)
    {
        ArgumentNullException.ThrowIfNull(config);
        var logger = LoggingSetup.Create(config.Logging, verbose ? LogEventLevel.Information : LogEventLevel.Warning);
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
