using DriftWatch.Core.Profiling;
using DriftWatch.Monitoring;
using DriftWatch.Store;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.DependencyInjection.Extensions;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Triage;

/// <summary>
/// Registers the triage actions and what they need beyond the store's database and the history and alert stores
/// (which the host registers). Idempotent: the worker's services and the dashboard's both call it.
/// </summary>
internal static class TriageServiceCollectionExtensions
{
    public static IServiceCollection AddDriftWatchTriage(this IServiceCollection services)
    {
        ArgumentNullException.ThrowIfNull(services);
        services.TryAddSingleton(TimeProvider.System);
        services.TryAddSingleton<IAuditStore>(sp => new AuditStore(sp.GetRequiredService<IStoreDatabase>()));
        services.TryAddSingleton<IBaselineResetStore>(sp => new BaselineResetStore(sp.GetRequiredService<IStoreDatabase>()));
        services.TryAddSingleton(sp => new BaselineService(
            sp.GetRequiredService<IHistoryStore>(),
            Profiler.Profile,
            sp.GetService<ILogger<BaselineService>>(),
            sp.GetRequiredService<IBaselineResetStore>()));
        services.TryAddSingleton(sp => new TriageActions(
            sp.GetRequiredService<IAlertStore>(),
            sp.GetRequiredService<IHistoryStore>(),
            sp.GetRequiredService<BaselineService>(),
            sp.GetRequiredService<IAuditStore>(),
            sp.GetRequiredService<TimeProvider>()));
        return services;
    }
}
