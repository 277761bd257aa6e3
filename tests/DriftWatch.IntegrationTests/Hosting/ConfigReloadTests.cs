using System.Net;
using System.Net.Sockets;
using System.Security.Cryptography;
using System.Text;
using System.Text.Json;
using DriftWatch.Store;
using Microsoft.Data.Sqlite;

namespace DriftWatch.IntegrationTests.Hosting;

/// <summary>
/// <c>driftwatch run</c> as a real process while its configuration file is edited: a bad edit is refused (the worker
/// keeps its configuration and /healthz names file:line:column), a good edit adds a pair that is then checked.
/// </summary>
public sealed class ConfigReloadTests : IDisposable
{
    private readonly string _folder = Path.Combine(Path.GetTempPath(), "dw-reload-" + Guid.NewGuid().ToString("N"));

    public ConfigReloadTests() => Directory.CreateDirectory(_folder);

    [Fact]
    public async Task Run_BadEditKeepsTheConfigurationAndReportsWhere_GoodEditAddsAPairThatIsChecked()
    {
        WorkerProcess.CreateSource(Path.Combine(_folder, "lab.db"));
        var port = FreePort();
        var config = Path.Combine(_folder, "driftwatch.yaml");
        var original = Config(port, extraPair: string.Empty);
        File.WriteAllText(config, original);
        using var client = new HttpClient { BaseAddress = new Uri($"http://127.0.0.1:{port}") };

        using var worker = WorkerProcess.Start(config);
        await worker.WaitForLineAsync("Checked first");
        var health = await HealthAsync(client);
        Assert.Equal(Sha256(original), health.GetProperty("configuration").GetProperty("sha256").GetString());
        Assert.Equal(JsonValueKind.Null, health.GetProperty("configuration").GetProperty("last_reload_error").ValueKind);

        // A bad edit: the new pair's schedule is not a cron expression. Written to a new file and renamed over the
        // old one, as editors do.
        var bad = Config(port, extraPair: """
              - name: second
                source: lab
                table: t
                x: a
                y: b
                schedule: "every now and then"
            """);
        Replace(config, bad);
        var line = bad.Split('\n').ToList().FindIndex(l => l.Contains("every now and then", StringComparison.Ordinal)) + 1;
        var column = bad.Split('\n')[line - 1].IndexOf('"', StringComparison.Ordinal) + 1;
        var refused = await UntilAsync(client, h => h.GetProperty("configuration").GetProperty("last_reload_error").ValueKind == JsonValueKind.Object);
        var errors = refused.GetProperty("configuration").GetProperty("last_reload_error").GetProperty("errors").EnumerateArray().Select(e => e.GetString()!).ToList();
        Assert.Contains(errors, e => e.StartsWith($"{config}:{line}:{column}: pairs[1].schedule:", StringComparison.Ordinal));
        Assert.Equal(Sha256(original), refused.GetProperty("configuration").GetProperty("sha256").GetString());
        await worker.WaitForLineAsync($"{config}:{line}:{column}: pairs[1].schedule:");

        // A good edit: the same pair with a valid schedule.
        var good = bad.Replace("every now and then", "* * * * * ?", StringComparison.Ordinal);
        Replace(config, good);
        var applied = await UntilAsync(client, h => h.GetProperty("configuration").GetProperty("sha256").GetString() == Sha256(good));
        Assert.Equal(JsonValueKind.Null, applied.GetProperty("configuration").GetProperty("last_reload_error").ValueKind);
        await worker.WaitForLineAsync("Reload: pair second added");
        await worker.WaitForLineAsync("Checked second");
        Assert.Equal(0, await worker.StopAsync());

        var store = StoreFactory.CreateHistoryStore(new SqliteStoreDatabase($"Data Source={Path.Combine(_folder, "store.db")}"), new DriftWatch.Core.Configuration.StoreConfig());
        Assert.NotEmpty(await store.GetRunsAsync("second", 10, includePoints: false, CancellationToken.None));
    }

    public void Dispose()
    {
        SqliteConnection.ClearAllPools();
        Directory.Delete(_folder, recursive: true);
    }

    private static string Config(int port, string extraPair) => $$"""
        sources:
          - name: lab
            kind: sqlite
            connection: lab.db
        store:
          kind: sqlite
          connection: store.db
        pairs:
          - name: first
            source: lab
            table: t
            x: a
            y: b
            schedule: "* * * * * ?"
        {{extraPair}}
        dashboard:
          enabled: true
          bind: 127.0.0.1
          port: {{port}}
        """;

    private static void Replace(string path, string text)
    {
        var temp = path + ".new";
        File.WriteAllText(temp, text);
        File.Move(temp, path, overwrite: true);
    }

    private static string Sha256(string text) => Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(text)));

    private static int FreePort()
    {
        using var listener = new TcpListener(IPAddress.Loopback, 0);
        listener.Start();
        return ((IPEndPoint)listener.LocalEndpoint).Port;
    }

    private static async Task<JsonElement> HealthAsync(HttpClient client) =>
        await UntilAsync(client, _ => true);

    /// <summary>Reads /healthz until <paramref name="done"/> holds (the worker may still be starting).</summary>
    private static async Task<JsonElement> UntilAsync(HttpClient client, Func<JsonElement, bool> done)
    {
        using var deadline = new CancellationTokenSource(WorkerProcess.Deadline);
        while (true)
        {
            try
            {
                var body = await client.GetStringAsync(new Uri("/healthz", UriKind.Relative), deadline.Token);
                var health = JsonDocument.Parse(body).RootElement.Clone();
                if (done(health))
                {
                    return health;
                }
            }
            catch (HttpRequestException)
            {
                // Not listening yet.
            }

            Assert.False(deadline.IsCancellationRequested, "gave up waiting on /healthz");
            await Task.Delay(100);
        }
    }
}
