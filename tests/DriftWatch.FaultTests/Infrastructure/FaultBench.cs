using System.Net.Http;
using DriftWatch.IntegrationTests.Infrastructure;
using Npgsql;

namespace DriftWatch.FaultTests.Infrastructure;

/// <summary>
/// The world of one fault test: a source database and a store database of their own on the shared PostgreSQL
/// server, a real SMTP server on a loopback port, a temp folder with the worker's YAML, a free dashboard port, and
/// the worker processes started on it. Faults are methods here (<see cref="StopSourceAsync"/>, the SMTP server's
/// <see cref="LoopbackSmtpServer.StopAsync"/>, <see cref="WorkerProcess.KillHardAsync"/>, …); what must hold after
/// any of them is <see cref="AssertEveryMailOnceAsync"/> plus the test's own checks of runs and alerts.
/// </summary>
public sealed partial class FaultBench : IAsyncDisposable
{
    public const string SourceTable = "loads";
    public const string SlowView = "slow_loads";

    private static readonly HttpClient Http = new() { Timeout = TimeSpan.FromSeconds(10) };
    private readonly PostgresServer _server;
    private readonly List<WorkerProcess> _workers = [];

    private FaultBench(PostgresServer server, PostgresDatabase source, PostgresDatabase store, LoopbackSmtpServer smtp, string folder)
    {
        _server = server;
        Source = source;
        Store = store;
        Smtp = smtp;
        Folder = folder;
    }

    public PostgresDatabase Source { get; }

    public PostgresDatabase Store { get; }

    public LoopbackSmtpServer Smtp { get; }

    public string Folder { get; }

    public int DashboardPort { get; } = FreePort.Next();

    public string ConfigPath => Path.Combine(Folder, "driftwatch.yaml");

    public WorkerSetup Setup { get; private set; } = new();

    public static async Task<FaultBench> CreateAsync(PostgresServer server)
    {
        var source = await PostgresDatabase.CreateAsync(server);
        var store = await PostgresDatabase.CreateAsync(server);
        // Any valid pair will do (invented numbers, not a statistics check): the faults are the point. slow_loads
        // reads the same rows after sleeping for pause.seconds, so a test holds a check in flight as long as it needs.
        await source.ExecuteAsync($"""
            CREATE TABLE {SourceTable} (km double precision, litres double precision);
            INSERT INTO {SourceTable} SELECT g, g * 0.3 + (g % 7) FROM generate_series(1, 500) g;
            CREATE TABLE pause (seconds double precision NOT NULL);
            INSERT INTO pause VALUES (0);
            CREATE VIEW {SlowView} AS
                SELECT l.km, l.litres FROM {SourceTable} l CROSS JOIN (SELECT pg_sleep(seconds) FROM pause) AS p;
            """);
        var folder = Path.Combine(Path.GetTempPath(), "dw-faults-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(folder);
        return new FaultBench(server, source, store, await LoopbackSmtpServer.StartAsync(), folder);
    }

    /// <summary>Writes the worker's YAML; a running worker sees the new file only if it reloads it.</summary>
    public void WriteConfig(WorkerSetup setup)
    {
        Setup = setup;
        // Written beside and renamed over the file, as editors do: a running worker's watcher never reads half a
        // file (a cut-off prefix can be valid YAML with fewer pairs, which would be a reload nobody asked for).
        var temp = ConfigPath + ".new";
        File.WriteAllText(temp, setup.Render(Source.ConnectionString, Store.ConnectionString, Smtp.Port, DashboardPort));
        File.Move(temp, ConfigPath, overwrite: true);
    }

    /// <summary>Starts <c>driftwatch run</c> on the written configuration and waits until /healthz answers ok.</summary>
    public async Task<WorkerProcess> StartWorkerAsync()
    {
        var worker = StartProcess();
        await Eventually.TrueAsync("/healthz to answer 200", async ct => worker.HasExited ? throw new InvalidOperationException("the worker exited at start\n" + worker.OutputLog()) : await HealthyAsync(ct), worker.OutputLog);
        return worker;
    }

    /// <summary>Starts the process without waiting for anything (for faults at start-up).</summary>
    public WorkerProcess StartProcess()
    {
        var worker = WorkerProcess.Start(ConfigPath);
        _workers.Add(worker);
        return worker;
    }

    /// <summary>True when the worker's /healthz answers 200 (store reachable, scheduler running).</summary>
    public async Task<bool> HealthyAsync(CancellationToken cancellationToken = default)
    {
        try
        {
            using var response = await Http.GetAsync(new Uri($"http://127.0.0.1:{DashboardPort}/healthz"), cancellationToken);
            return response.IsSuccessStatusCode;
        }
        catch (HttpRequestException)
        {
            return false;
        }
    }

    // ---- faults of the source ----

    /// <summary>The source database refuses every connection and its open sessions are ended: a source server gone.</summary>
    public Task StopSourceAsync() => StopDatabaseAsync(Source);

    public Task StartSourceAsync() => StartDatabaseAsync(Source);

    /// <summary>
    /// The same for any database of the bench; <see cref="Store"/> gives the store-down fault. The server itself
    /// keeps running for the other tests, and the database keeps its data: only its connections are refused.
    /// </summary>
    public async Task StopDatabaseAsync(PostgresDatabase database)
    {
        ArgumentNullException.ThrowIfNull(database);
        var name = new NpgsqlConnectionStringBuilder(database.ConnectionString).Database!;
        await _server.ExecuteAdminAsync($"ALTER DATABASE {name} ALLOW_CONNECTIONS false");
        await _server.ExecuteAdminAsync($"SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = '{name}'");
        // The bench's own idle pooled sessions were ended too; drop them so its next read opens a new one.
        using var pooled = new NpgsqlConnection(database.ConnectionString);
        NpgsqlConnection.ClearPool(pooled);
    }

    public async Task StartDatabaseAsync(PostgresDatabase database)
    {
        ArgumentNullException.ThrowIfNull(database);
        var name = new NpgsqlConnectionStringBuilder(database.ConnectionString).Database!;
        await _server.ExecuteAdminAsync($"ALTER DATABASE {name} ALLOW_CONNECTIONS true");
    }

    /// <summary>How long a read of <see cref="SlowView"/> sleeps first.</summary>
    public Task SetPauseAsync(double seconds) =>
        Source.ExecuteAsync($"UPDATE pause SET seconds = {seconds.ToString(System.Globalization.CultureInfo.InvariantCulture)}");

    /// <summary>Queries of the source database now running pg_sleep (a check in flight on <see cref="SlowView"/>).</summary>
    public async Task<long> SleepingQueriesAsync()
    {
        var name = new NpgsqlConnectionStringBuilder(Source.ConnectionString).Database!;
        await using var connection = new NpgsqlConnection(_server.AdminConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(
            "SELECT count(*) FROM pg_stat_activity WHERE datname = @db AND state = 'active' AND query ILIKE '%slow_loads%' AND pid <> pg_backend_pid()", connection);
        command.Parameters.AddWithValue("db", name);
        return (long)(await command.ExecuteScalarAsync())!;
    }

    // ---- what the store holds ----

    public async Task<IReadOnlyList<RunRow>> RunsAsync(string pair)
    {
        var rows = new List<RunRow>();
        await using var connection = new NpgsqlConnection(Store.ConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand("SELECT id, status, error FROM runs WHERE pair = @pair ORDER BY id", connection);
        command.Parameters.AddWithValue("pair", pair);
        await using var reader = await command.ExecuteReaderAsync();
        while (await reader.ReadAsync())
        {
            rows.Add(new RunRow(reader.GetInt64(0), reader.GetString(1), reader.IsDBNull(2) ? null : reader.GetString(2)));
        }

        return rows;
    }

    public async Task<IReadOnlyList<OutboxRow>> OutboxAsync()
    {
        var rows = new List<OutboxRow>();
        await using var connection = new NpgsqlConnection(Store.ConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand("SELECT message_id, sent_at_ms IS NOT NULL, attempts, last_error, subject, channel FROM outbox ORDER BY id", connection);
        await using var reader = await command.ExecuteReaderAsync();
        while (await reader.ReadAsync())
        {
            rows.Add(new OutboxRow(reader.GetString(0), reader.GetBoolean(1), reader.GetInt32(2), reader.IsDBNull(3) ? null : reader.GetString(3), reader.GetString(4)) { Channel = reader.GetString(5) });
        }

        return rows;
    }

    /// <summary>The check-failing alerts of <paramref name="pair"/>, oldest first.</summary>
    public async Task<IReadOnlyList<AlertRow>> CheckFailingAlertsAsync(string pair)
    {
        var rows = new List<AlertRow>();
        await using var connection = new NpgsqlConnection(Store.ConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(
            "SELECT id, status, confirmed_at_ms IS NOT NULL FROM alerts WHERE pair = @pair AND lower(replace(kind, '_', '')) = 'checkfailing' ORDER BY id", connection);
        command.Parameters.AddWithValue("pair", pair);
        await using var reader = await command.ExecuteReaderAsync();
        while (await reader.ReadAsync())
        {
            rows.Add(new AlertRow(reader.GetInt64(0), reader.GetString(1), reader.GetBoolean(2)));
        }

        return rows;
    }

    /// <summary>
    /// No mail lost, none sent twice: every message the outbox marks sent reached the SMTP server exactly once
    /// (counted by Message-Id), and the server got nothing the outbox does not hold. Call it with the worker stopped,
    /// so no new message appears between the two reads.
    /// </summary>
    public async Task AssertEveryMailOnceAsync()
    {
        // The mail channel's messages; a webhook list's are checked against its receiver by the test that adds one.
        var outbox = (await OutboxAsync()).Where(m => m.Channel == "smtp").ToList();
        var received = Smtp.ReceivedIds;
        var context = $"outbox: {string.Join(", ", outbox)}; received: {string.Join(", ", received)}";
        Assert.True(received.Count == received.Distinct(StringComparer.Ordinal).Count(), "a message arrived twice: " + context);
        var held = outbox.Select(m => m.MessageId).ToHashSet(StringComparer.Ordinal);
        Assert.True(received.All(held.Contains), "the server got a message the outbox does not hold: " + context);
        var sent = outbox.Where(m => m.Sent).Select(m => m.MessageId).ToHashSet(StringComparer.Ordinal);
        Assert.True(sent.SetEquals(received), "sent and received differ: " + context);
    }

    /// <summary>Waits until the outbox holds at least <paramref name="count"/> messages and all of them are sent.</summary>
    public Task WaitAllSentAsync(int count, Func<string> context) =>
        Eventually.TrueAsync($"at least {count} outbox messages, all sent", async _ =>
        {
            var outbox = await OutboxAsync();
            return outbox.Count >= count && outbox.All(m => m.Sent);
        }, context);

    public async ValueTask DisposeAsync()
    {
        foreach (var worker in _workers)
        {
            worker.Dispose();
        }

        await Smtp.DisposeAsync();
        await StartDatabaseAsync(Source);
        await StartDatabaseAsync(Store);
        await Source.DisposeAsync();
        await Store.DisposeAsync();
        Directory.Delete(Folder, recursive: true);
    }
}

public sealed record RunRow(long Id, string Status, string? Error);

public sealed record OutboxRow(string MessageId, bool Sent, int Attempts, string? LastError, string Subject)
{
    public string Channel { get; init; } = "smtp";
}

public sealed record AlertRow(long Id, string Status, bool Confirmed);
