using DriftWatch.Core.Configuration;
using DriftWatch.Dashboard;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Tests.Dashboard;

/// <summary>A real Kestrel dashboard on a free loopback port over a scenario's store, and a client for it.</summary>
internal sealed class DashboardHost : IAsyncDisposable
{
    private DashboardHost(DashboardServer server, HttpClient client, LogLines logs)
    {
        Server = server;
        Client = client;
        Logs = logs;
    }

    public DashboardServer Server { get; }

    public HttpClient Client { get; }

    public LogLines Logs { get; }

    public static async Task<DashboardHost> StartAsync(DashboardScenario scenario, DashboardConfig? dashboard = null, IWorkerHealth? health = null)
    {
        ArgumentNullException.ThrowIfNull(scenario);
        var config = dashboard is null ? scenario.Config : scenario.Config with { Dashboard = dashboard };
        return await StartAsync(new DashboardServerOptions(config, scenario.Database, scenario.History, scenario.Alerts)
        {
            Time = DashboardScenario.Clock,
            WorkerHealth = health,
        });
    }

    public static async Task<DashboardHost> StartAsync(DashboardServerOptions options)
    {
        var logs = new LogLines();
        var server = await DashboardServer.StartAsync(
            options with { Listen = new System.Net.IPEndPoint(System.Net.IPAddress.Loopback, 0), Logging = b => b.AddProvider(logs) },
            CancellationToken.None);
        // Redirects are asserted, not followed.
        var client = new HttpClient(new HttpClientHandler { AllowAutoRedirect = false, UseCookies = false }) { BaseAddress = server.Address };
        return new DashboardHost(server, client, logs);
    }

    public async Task<(int Status, string Body)> GetAsync(string path)
    {
        using var response = await Client.GetAsync(new Uri(path, UriKind.Relative));
        return ((int)response.StatusCode, await response.Content.ReadAsStringAsync());
    }

    public async ValueTask DisposeAsync()
    {
        Client.Dispose();
        await Server.DisposeAsync();
    }
}

/// <summary>Collects formatted log messages of every category.</summary>
internal sealed class LogLines : ILoggerProvider
{
    private readonly System.Collections.Concurrent.ConcurrentQueue<string> _lines = new();

    public IReadOnlyList<string> Lines => [.. _lines];

    public ILogger CreateLogger(string categoryName) => new Collector(_lines);

    public void Dispose()
    {
    }

    private sealed class Collector(System.Collections.Concurrent.ConcurrentQueue<string> lines) : ILogger
    {
        public IDisposable? BeginScope<TState>(TState state)
            where TState : notnull => null;

        public bool IsEnabled(LogLevel logLevel) => logLevel >= LogLevel.Information;

        public void Log<TState>(LogLevel logLevel, EventId eventId, TState state, Exception? exception, Func<TState, Exception?, string> formatter) =>
            lines.Enqueue(formatter(state, exception));
    }
}
