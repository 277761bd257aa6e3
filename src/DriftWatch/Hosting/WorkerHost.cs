using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard;
using DriftWatch.Scheduling;
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
    /// <summary>How often alert evaluation looks for new runs.</summary>
    public static readonly TimeSpan DefaultAlertEvery = TimeSpan.FromSeconds(30);

    public static WebApplication Build(DriftWatchConfig config, WorkerHostOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(config);
        options ??= new WorkerHostOptions();
        var builder = WebApplication.CreateSlimBuilder(new WebApplicationOptions { Args = [] });
        var logger = LoggingSetup.Create(config.Logging);
        builder.Logging.ClearProviders();
        builder.Services.AddSerilog(logger, dispose: true);
        builder.Host.UseSystemd();
        builder.Services.Configure<HostOptions>(o => o.ShutdownTimeout = SchedulingSetup.ShutdownGrace);

        var time = options.Time ?? TimeProvider.System;
        builder.Services.AddDriftWatch(config, time);
        builder.Services.AddQuartz(quartz =>
        {
            quartz.UseTimeProvider(time);
            SchedulingSetup.AddPairSchedules(quartz, config, options.AlertEvery);
        });
        builder.Services.AddQuartzHostedService(q =>
        {
            // SIGTERM: running checks get the grace period to finish, then their tokens are cancelled.
            q.WaitForJobsToComplete = true;
        });

        builder.Services.AddSingleton<IWorkerHealth, SchedulerHealth>();
        if (config.Dashboard.Enabled)
        {
            DashboardServices.Add(builder.Services, config.Dashboard);
            builder.WebHost.UseUrls(options.Urls ?? DashboardServer.ListenUrl(config.Dashboard));
        }
        else
        {
            // No dashboard: nothing listens beyond an ephemeral loopback port the host insists on.
            builder.WebHost.UseUrls("http://127.0.0.1:0");
        }

        var app = builder.Build();
        if (config.Dashboard.Enabled)
        {
            DashboardEndpoints.Map(app);
        }

        return app;
    }
}

internal sealed record WorkerHostOptions
{
    public TimeProvider? Time { get; init; }

    public TimeSpan AlertEvery { get; init; } = WorkerHost.DefaultAlertEvery;

    /// <summary>Overrides the dashboard's URL (tests bind to port 0).</summary>
    public string? Urls { get; init; }
}
