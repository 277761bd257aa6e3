using DriftWatch.Alerting;
using DriftWatch.Alerting.Evaluation;
using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Profiling;
using DriftWatch.Monitoring;
using DriftWatch.Sources;
using DriftWatch.Spool;
using DriftWatch.Store;
using DriftWatch.Triage;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Hosting;

/// <summary>
/// The composition root of the flow (config → sources → checks → store → alerts), shared by the worker
/// (<c>run</c>), one-shot commands (<c>check</c>, <c>baseline</c>, <c>history</c>) and the demo, so
/// all of them exercise the same objects.
/// </summary>
internal static class DriftWatchServices
{
    /// <param name="asWorker">True for <c>run</c>: outbox claims carry the worker's stable name (see <see cref="ClaimOwner"/>).</param>
    public static IServiceCollection AddDriftWatch(this IServiceCollection services, DriftWatchConfig config, TimeProvider time, bool asWorker = false)
    {
        ArgumentNullException.ThrowIfNull(services);
        ArgumentNullException.ThrowIfNull(config);
        ArgumentNullException.ThrowIfNull(time);
        services.AddSingleton(config);
        services.AddSingleton(time);
        services.AddSingleton(_ => StoreFactory.CreateDatabase(config.Store));
        services.AddSingleton<IHistoryStore>(sp => StoreFactory.CreateHistoryStore(sp.GetRequiredService<IStoreDatabase>(), config.Store));
        // Shared reads keep what they learn about columns in the store, for the next process and the other workers.
        services.AddSingleton(sp => new ColumnHintStore(sp.GetRequiredService<IStoreDatabase>()));
        services.AddSingleton<IColumnHints>(sp => sp.GetRequiredService<ColumnHintStore>());
        services.AddSingleton<SourceFactory>();
        services.AddSingleton<ISourceFactory>(sp => sp.GetRequiredService<SourceFactory>());
        // BaselineService (with the reset store) comes with the triage services below.
        // The worker adds a spool (WorkerHost); one-shot commands record straight to the store.
        services.AddSingleton(sp => new RunRecorder(
            sp.GetRequiredService<IHistoryStore>(),
            sp.GetRequiredService<ILogger<RunRecorder>>(),
            sp.GetService<RunSpool>(),
            sp.GetService<CheckMarkers>()));
        services.AddDriftWatchTriage();
        services.AddSingleton<PairChecker>();
        services.AddSingleton<TableGroups>();
        services.AddSingleton<MonitorCycle>();
        services.AddSingleton<CheckPass>();
        services.AddSingleton<RunFeed>();

        // Hosted services start in registration order: the schema is migrated before anything reads the store.
        services.AddHostedService<StoreMigrationService>();

        // Alerting: lifecycle and outbox in the store, digests composed per mailing list, channels deliver.
        var owner = asWorker ? ClaimOwner.OfWorker(config.Worker) : ClaimOwner.OfOneShot(config.Worker);
        services.AddDriftWatchAlerting(config.Alerting, new OutboxOptions { ClaimOwner = owner });
        services.AddSingleton<AlertEvaluation>();
        return services;
    }

    /// <summary>Brings the store's schema up to date; every entry point calls it before the first read or write.</summary>
    public static async Task MigrateStoreAsync(this IServiceProvider services, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(services);
        var database = services.GetRequiredService<IStoreDatabase>();
        try
        {
            await new MigrationRunner(database, services.GetService<TimeProvider>()).MigrateAsync(cancellationToken);
        }
        catch (Exception ex) when (ex is System.Data.Common.DbException or System.Net.Sockets.SocketException or IOException or TimeoutException)
        {
            throw new StoreUnavailableException($"the {database.Dialect} store could not be opened: {ex.Message}", ex);
        }
    }
}
