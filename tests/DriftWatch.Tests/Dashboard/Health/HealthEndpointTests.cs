using System.Net;
using System.Net.Sockets;
using System.Text.Json;
using DriftWatch.Dashboard;
using DriftWatch.Store;

namespace DriftWatch.Tests.Dashboard.Health;

public sealed class HealthEndpointTests
{
    [Theory]
    [InlineData(true, 200, "ok")]
    [InlineData(false, 503, "unhealthy")]
    public async Task Healthz_ReachableStore_FollowsTheScheduler(bool running, int expectedStatus, string expectedWord)
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        await using var host = await DashboardHost.StartAsync(scenario, health: WorkerHealth.From(() => running));

        var (status, body) = await host.GetAsync("/healthz");

        Assert.Equal(expectedStatus, status);
        using var json = JsonDocument.Parse(body);
        Assert.Equal(expectedWord, json.RootElement.GetProperty("status").GetString());
        Assert.True(json.RootElement.GetProperty("store").GetProperty("reachable").GetBoolean());
        Assert.Equal(running, json.RootElement.GetProperty("scheduler").GetProperty("running").GetBoolean());
    }

    [Fact]
    public async Task Healthz_PostgresStoreNobodyListensOn_Is503WithTheReason()
    {
        // A real Npgsql connection to a loopback port that was free a moment ago: connection refused.
        var port = FreePort();
        var config = DashboardScenario.BuildConfig("unused.db", hostile: false) with
        {
            Store = new() { Kind = Core.Configuration.StoreKind.Postgres, ConnectionString = $"Host=127.0.0.1;Port={port};Username=nobody;Timeout=3" },
        };
        var database = StoreFactory.CreateDatabase(config.Store);
        await using var host = await DashboardHost.StartAsync(new DashboardServerOptions(config, database, new HistoryStore(database), new AlertStore(database))
        {
            Time = DashboardScenario.Clock,
            WorkerHealth = WorkerHealth.From(() => true),
        });

        var (status, body) = await host.GetAsync("/healthz");

        Assert.Equal(503, status);
        using var json = JsonDocument.Parse(body);
        Assert.Equal("unhealthy", json.RootElement.GetProperty("status").GetString());
        var store = json.RootElement.GetProperty("store");
        Assert.False(store.GetProperty("reachable").GetBoolean());
        Assert.Contains("Npgsql", store.GetProperty("error").GetString(), StringComparison.Ordinal);

        // The pages and the API say the same instead of failing with a stack trace.
        Assert.Equal(503, (await host.GetAsync("/")).Status);
        Assert.Equal(503, (await host.GetAsync("/api/pairs")).Status);
        Assert.Equal(503, (await host.GetAsync("/metrics")).Status);
    }

    [Fact]
    public async Task Healthz_SqliteFileWithoutTheSchema_Is503()
    {
        var path = Path.Combine(Path.GetTempPath(), "driftwatch-empty-" + Guid.NewGuid().ToString("N") + ".db");
        try
        {
            var config = DashboardScenario.BuildConfig(path, hostile: false);
            var database = StoreFactory.CreateDatabase(config.Store); // not migrated: no tables
            await using var host = await DashboardHost.StartAsync(new DashboardServerOptions(config, database, new HistoryStore(database), new AlertStore(database)) { Time = DashboardScenario.Clock });

            var (status, body) = await host.GetAsync("/healthz");

            Assert.Equal(503, status);
            Assert.Contains("no such table", body, StringComparison.Ordinal);
        }
        finally
        {
            Microsoft.Data.Sqlite.SqliteConnection.ClearAllPools();
            File.Delete(path);
        }
    }

    [Fact]
    public async Task Healthz_WithoutASchedulerInTheProcess_JudgesTheStoreAlone()
    {
        await using var scenario = await DashboardScenario.CreateAsync(populate: false);
        await using var host = await DashboardHost.StartAsync(scenario);

        var (status, body) = await host.GetAsync("/healthz");

        Assert.Equal(200, status);
        using var json = JsonDocument.Parse(body);
        Assert.False(json.RootElement.GetProperty("scheduler").GetProperty("checked").GetBoolean());
    }

    private static int FreePort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        return ((IPEndPoint)listener.LocalEndpoint).Port;
    }
}
