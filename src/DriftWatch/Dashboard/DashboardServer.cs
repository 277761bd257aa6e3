using System.Net;
using DriftWatch.Core.Configuration;
using DriftWatch.Store;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Dashboard;

/// <summary>What a standalone dashboard server reads and where it listens.</summary>
internal sealed record DashboardServerOptions(
    DriftWatchConfig Config,
    IStoreDatabase Database,
    IHistoryStore History,
    IAlertStore Alerts)
{
    /// <summary>The outbox of the same store, unless a test passes its own.</summary>
    public IOutboxStore Outbox { get; init; } = new OutboxStore(Database);

    public TimeProvider Time { get; init; } = TimeProvider.System;

    public IWorkerHealth? WorkerHealth { get; init; }

    /// <summary>Overrides the endpoint from <see cref="DriftWatchConfig.Dashboard"/>; tests pass 127.0.0.1 port 0.</summary>
    public IPEndPoint? Listen { get; init; }

    /// <summary>Replaces the default console logging (tests collect log lines).</summary>
    public Action<ILoggingBuilder>? Logging { get; init; }
}

/// <summary>
/// A dashboard on its own Kestrel server (tests, <c>demo --serve</c>). The worker's host maps the same
/// endpoints with <see cref="DashboardServices.Add"/> and <see cref="DashboardEndpoints.Map"/> instead.
/// </summary>
internal sealed class DashboardServer : IAsyncDisposable
{
    private readonly WebApplication _app;

    private DashboardServer(WebApplication app, Uri address)
    {
        _app = app;
        Address = address;
    }

    /// <summary>The bound address, with the real port when port 0 was asked for.</summary>
    public Uri Address { get; }

    public IServiceProvider Services => _app.Services;

    public static async Task<DashboardServer> StartAsync(DashboardServerOptions options, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(options);
        var builder = WebApplication.CreateSlimBuilder();
        var endPoint = options.Listen ?? DashboardBinding.EndPoint(options.Config.Dashboard);
        builder.WebHost.ConfigureKestrel(kestrel => kestrel.Listen(endPoint));
        if (options.Logging is { } logging)
        {
            builder.Logging.ClearProviders();
            logging(builder.Logging);
        }

        builder.Services.AddSingleton(options.Config);
        builder.Services.AddSingleton(options.Database);
        builder.Services.AddSingleton(options.History);
        builder.Services.AddSingleton(options.Alerts);
        builder.Services.AddSingleton(options.Outbox);
        builder.Services.AddSingleton(options.Time);
        if (options.WorkerHealth is { } health)
        {
            builder.Services.AddSingleton(health);
        }

        DashboardServices.Add(builder.Services, options.Config.Dashboard);
        var app = builder.Build();
        DashboardEndpoints.Map(app);
        try
        {
            await app.StartAsync(cancellationToken);
            var bound = app.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.First();
            return new DashboardServer(app, new Uri(bound));
        }
        catch
        {
            await app.DisposeAsync();
            throw;
        }
    }

    public Task StopAsync(CancellationToken cancellationToken) => _app.StopAsync(cancellationToken);

    public async ValueTask DisposeAsync()
    {
        await _app.StopAsync(CancellationToken.None);
        await _app.DisposeAsync();
    }
}
