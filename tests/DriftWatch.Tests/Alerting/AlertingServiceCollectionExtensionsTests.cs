using DriftWatch.Alerting;
using DriftWatch.Alerting.Channels;
using DriftWatch.Alerting.Evaluation;
using DriftWatch.Alerting.Outbox;
using DriftWatch.Core.Configuration;
using DriftWatch.Store;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;

namespace DriftWatch.Tests.Alerting;

public sealed class AlertingServiceCollectionExtensionsTests
{
    [Fact]
    public void AddDriftWatchAlerting_ResolvesTheCycleTheDispatcherAndEveryChannel()
    {
        var services = new ServiceCollection()
            .AddLogging()
            .AddSingleton<IStoreDatabase>(new SqliteStoreDatabase("Data Source=:memory:"))
            .AddDriftWatchAlerting(new AlertingConfig());
        using var provider = services.BuildServiceProvider(new ServiceProviderOptions { ValidateOnBuild = true, ValidateScopes = true });

        Assert.NotNull(provider.GetRequiredService<AlertCycleProcessor>());
        Assert.NotNull(provider.GetRequiredService<OutboxDispatcher>());
        Assert.Equal([ChannelKind.Smtp, ChannelKind.File, ChannelKind.Webhook], provider.GetServices<IAlertChannel>().Select(c => c.Kind));
        Assert.Single(provider.GetServices<IHostedService>().OfType<OutboxDispatchService>());
    }
}
