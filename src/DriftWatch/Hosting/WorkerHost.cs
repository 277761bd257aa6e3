using System.Net;
using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard;
using DriftWatch.Scheduling;
using DriftWatch.Spool;
using DriftWatch.Store;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Hosting;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;
using Quartz;
using Serilog;

namespace DriftWatch.Hosting;

/// <summary>
/// The hosted worker of <c>driftwatch run</c>: scheduler (one job per pair), alert evaluation, outbox
/// delivery and the dashboard, in one generic host with Serilog and systemd integration.
/// </summary>
internal static class WorkerHost
{
    /// <summary>How often alert evaluation looks for new runs, unless <c>worker.alert_every</c> says otherwise.</summary>
    public static readonly TimeSpan DefaultAlertEvery = WorkerConfig.DefaultAlertEvery;

    public static WebApplication Build(DriftWatchConfig config, WorkerHostOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(config);
        options ??= new WorkerHostOptions();
        var builder = WebApplication.CreateSlimBuilder(new WebApplicationOptions { Args = [] });
        var logger = LoggingSetup.Create(config.Logging);
        builder.Logging.ClearProviders();
        builder.Services.AddSerilog(logger, dispose: true);
        builder.Host.UseSystemd();
        // The host waits for the checks' grace plus the time to record them; StopGrace cancels the checks.
        builder.Services.Configure<HostOptions>(o => o.ShutdownTimeout = StopGrace.HostShutdownTimeout(config.Worker.StopGrace));
        builder.Services.AddSingleton<Scheduling.RunningChecks>();
        builder.Services.AddSingleton(sp => new StopGrace(config.Worker.StopGrace, sp.GetRequiredService<IHostApplicationLifetime>(), sp.GetRequiredService<ILogger<StopGrace>>()));

        var time = options.Time ?? TimeProvider.System;
        builder.Services.AddDriftWatch(config, time, asWorker: true);
        builder.Services.AddSingleton(new LiveConfig(config, InitialHash(config), time.GetUtcNow()));
        // Pairs of one table due in the same slot share a read; the store-held claims keep each slot checked once.
        builder.Services.AddSingleton<ISlotClaims>(sp =>
            new SlotClaimStore(sp.GetRequiredService<IStoreDatabase>(), sp.GetRequiredService<Workers.WorkerIdentity>().Id, time));
        builder.Services.AddSingleton<SlotGroups>();

        // Runs the store cannot take wait in the spool; checks leave start markers there. The spool service turns
        // markers left by the previous process into interrupted runs before the scheduler (registered after it) starts.
        var spool = SpoolOptions.From(config);
        builder.Services.AddSingleton(spool);
        builder.Services.AddSingleton<RunSpool>();
        builder.Services.AddSingleton<CheckMarkers>();
        builder.Services.AddSingleton<SpoolDrain>();
        builder.Services.AddHostedService<SpoolService>();
        builder.Services.AddHostedService<ConfigReloadService>();

        // This process among the workers on the store: its heartbeat row, its leases, its Quartz instance id.
        var identity = Workers.WorkerIdentity.Create(config.Worker, time.GetUtcNow());
        builder.Services.AddSingleton(identity);
        builder.Services.AddSingleton<Workers.LastCheck>();
        builder.Services.AddSingleton(sp => new Store.WorkerInstances(sp.GetRequiredService<Store.IStoreDatabase>()));
        builder.Services.AddSingleton(sp => new Store.WorkerLeases(sp.GetRequiredService<Store.IStoreDatabase>()));
        builder.Services.AddSingleton(sp => new Store.RunSlots(sp.GetRequiredService<Store.IStoreDatabase>()));
        builder.Services.AddSingleton<Workers.ExclusiveWork>();
        builder.Services.AddHostedService<Workers.HeartbeatService>();
        builder.Services.AddQuartz(quartz =>
        {
            quartz.UseTimeProvider(time);
            if (config.Worker.SharedSchedule)
            {
                // The jobs live in the store; StoredSchedules (below) reconciles them with the configuration.
                SharedSchedule.Configure(quartz, config, identity);
            }
            else
            {
                SchedulingSetup.AddPairSchedules(quartz, config, options.AlertEvery ?? config.Worker.AlertEvery);
            }
        });
        if (config.Worker.SharedSchedule)
        {
            // Registered before Quartz's hosted service: the stored jobs match the configuration before the scheduler starts.
            builder.Services.AddHostedService<StoredSchedules>();
        }

        builder.Services.AddQuartzHostedService(q =>
        {
            // SIGTERM: running checks get the grace period to finish (StopGrace), then their tokens are cancelled.
            q.WaitForJobsToComplete = true;
        });

        builder.Services.AddSingleton<IWorkerHealth, SchedulerHealth>();
        builder.Services.AddSingleton<IWorkerStatus, WorkerStatus>();
        if (config.Dashboard.Enabled)
        {
            DashboardServices.Add(builder.Services, config.Dashboard);
        }

        // An IPEndPoint, never a URL: the address is exactly the one the loader validated. Without a dashboard
        // nothing listens beyond an ephemeral loopback port the host insists on.
        var endPoint = options.DashboardEndPoint ?? ListenEndPoint(config);
        builder.WebHost.ConfigureKestrel(kestrel => kestrel.Listen(endPoint));

        var app = builder.Build();
        if (config.Dashboard.Enabled)
        {
            DashboardEndpoints.Map(app);
        }

        return app;
    }

    /// <summary>The hash of the file's text the configuration was read from ("none" for a configuration not read from a file).</summary>
    private static string InitialHash(DriftWatchConfig config)
    {
        try
        {
            return config.FilePath is { } file ? LiveConfig.Hash(File.ReadAllText(file)) : "none";
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            return "unreadable";
        }
    }

    /// <summary>Where <c>run</c> listens: the dashboard's address and port, or an ephemeral loopback port without a dashboard.</summary>
    public static IPEndPoint ListenEndPoint(DriftWatchConfig config)
    {
        ArgumentNullException.ThrowIfNull(config);
        return config.Dashboard.Enabled ? DashboardBinding.EndPoint(config.Dashboard) : new IPEndPoint(IPAddress.Loopback, 0);
    }
}

internal sealed record WorkerHostOptions
{
    public TimeProvider? Time { get; init; }

    /// <summary>Overrides <c>worker.alert_every</c>.</summary>
    public TimeSpan? AlertEvery { get; init; }

    /// <summary>Overrides the dashboard's endpoint (tests bind to port 0).</summary>
    public IPEndPoint? DashboardEndPoint { get; init; }
}
