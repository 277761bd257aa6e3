using DriftWatch.Alerting.Channels;
using DriftWatch.Alerting.Channels.File;
using DriftWatch.Alerting.Channels.Smtp;
using DriftWatch.Alerting.Channels.Webhook;
using DriftWatch.Alerting.Evaluation;
using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Configuration;
using DriftWatch.Store;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.DependencyInjection.Extensions;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Alerting;

/// <summary>Registers the alerting path. The host registers <see cref="IStoreDatabase"/> (the store) beforehand.</summary>
internal static class AlertingServiceCollectionExtensions
{
    public static IServiceCollection AddDriftWatchAlerting(this IServiceCollection services, AlertingConfig config, OutboxOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(services);
        ArgumentNullException.ThrowIfNull(config);
        services.TryAddSingleton(TimeProvider.System);
        services.AddSingleton(config);
        services.AddSingleton(options ?? new OutboxOptions());
        services.TryAddSingleton<IAlertStore, AlertStore>();
        services.TryAddSingleton<IOutboxStore, OutboxStore>();
        services.AddSingleton<OutboxSignal>();
        services.AddSingleton<IAlertChannel>(_ => new SmtpAlertChannel(config.Smtp));
        services.AddSingleton<IAlertChannel, FileAlertChannel>();
        services.AddSingleton<IAlertChannel>(sp => new WebhookAlertChannel(sp.GetRequiredService<TimeProvider>()));
        services.AddSingleton(sp => new OutboxDispatcher(
            sp.GetRequiredService<IOutboxStore>(),
            sp.GetServices<IAlertChannel>(),
            config,
            sp.GetRequiredService<OutboxOptions>(),
            sp.GetRequiredService<TimeProvider>(),
            // Thread-safe; jitter needs no reproducibility outside tests.
            Random.Shared,
            sp.GetRequiredService<ILogger<OutboxDispatcher>>()));
        services.AddSingleton<AlertCycleProcessor>();
        services.AddHostedService<OutboxDispatchService>();
        return services;
    }
}
