using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard.Access;
using DriftWatch.Dashboard.Data;
using DriftWatch.Dashboard.Health;
using DriftWatch.Dashboard.Metrics;
using DriftWatch.Store;
using DriftWatch.Triage;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.DependencyInjection.Extensions;

namespace DriftWatch.Dashboard;

/// <summary>
/// Registers what <see cref="DashboardEndpoints.Map"/> needs. The host registers the rest: DriftWatchConfig,
/// IStoreDatabase, IHistoryStore, IAlertStore and IOutboxStore (singletons), and optionally <see cref="IWorkerHealth"/>; the
/// triage actions' services are added here unless the host added them (<see cref="TriageServiceCollectionExtensions"/>).
/// Throws when the configuration binds beyond loopback without an access token.
/// </summary>
internal static class DashboardServices
{
    public static IServiceCollection Add(IServiceCollection services, DashboardConfig config)
    {
        ArgumentNullException.ThrowIfNull(services);
        ArgumentNullException.ThrowIfNull(config);
        // Refused here, before anything starts, rather than at the first request.
        DashboardAccess.Validate(config);
        services.TryAddSingleton(TimeProvider.System);
        services.AddSingleton(sp => new DashboardAccess(config, sp.GetRequiredService<TimeProvider>()));
        services.AddSingleton(sp => new DashboardReader(
            sp.GetRequiredService<DriftWatchConfig>(),
            sp.GetRequiredService<IHistoryStore>(),
            sp.GetRequiredService<IAlertStore>(),
            sp.GetRequiredService<IOutboxStore>(),
            sp.GetRequiredService<TimeProvider>()));
        services.AddSingleton(sp => new DashboardMetrics(
            sp.GetRequiredService<IStoreDatabase>(),
            sp.GetRequiredService<IAlertStore>(),
            sp.GetRequiredService<DriftWatchConfig>(),
            sp.GetRequiredService<TimeProvider>(),
            sp.GetService<IWorkerStatus>()));
        // The pair page's actions: the same TriageActions the CLI uses (registered once whichever host calls first).
        services.AddDriftWatchTriage();
        services.AddSingleton(sp => new HealthCheck(
            sp.GetRequiredService<IHistoryStore>(),
            sp.GetRequiredService<TimeProvider>(),
            sp.GetService<IWorkerHealth>(),
            sp.GetService<IWorkerStatus>(),
            new WorkerInstances(sp.GetRequiredService<IStoreDatabase>()),
            sp.GetRequiredService<DriftWatchConfig>().Worker.TakeoverAfter));
        return services;
    }
}
