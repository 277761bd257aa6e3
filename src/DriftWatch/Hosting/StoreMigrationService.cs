using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Hosting;

/// <summary>Brings the store's schema up to date before the scheduler starts (hosted services start in registration order).</summary>
internal sealed class StoreMigrationService(IServiceProvider services, ILogger<StoreMigrationService> logger) : IHostedService
{
    public async Task StartAsync(CancellationToken cancellationToken)
    {
        await services.MigrateStoreAsync(cancellationToken);
        logger.LogInformation("Store schema is up to date");
    }

    public Task StopAsync(CancellationToken cancellationToken) => Task.CompletedTask;
}
