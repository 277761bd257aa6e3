using System.Net.Http;
using Npgsql;

namespace DriftWatch.FaultTests.Infrastructure;

/// <summary>Several workers on one store and one configuration file (<see cref="WorkerSetup.Shared"/>), and what the store tells about them.</summary>
public sealed partial class FaultBench
{
    /// <summary>Starts a worker of a shared schedule under <paramref name="workerId"/> (its own port and spool) and waits for its /healthz.</summary>
    public async Task<WorkerProcess> StartSharedWorkerAsync(string workerId, int port)
    {
        var spool = Path.Combine(Folder, "spool-" + workerId);
        var worker = WorkerProcess.Start(ConfigPath, WorkerProcess.SharedEnvironment(workerId, port, spool));
        _workers.Add(worker);
        await Eventually.TrueAsync(
            $"/healthz of {workerId} to answer 200",
            async ct => worker.HasExited ? throw new InvalidOperationException($"worker {workerId} exited at start\n" + worker.OutputLog()) : await HealthyAsync(port, ct),
            worker.OutputLog);
        return worker;
    }

    public static async Task<bool> HealthyAsync(int port, CancellationToken cancellationToken = default)
    {
        try
        {
            using var response = await Http.GetAsync(new Uri($"http://127.0.0.1:{port}/healthz"), cancellationToken);
            return response.IsSuccessStatusCode;
        }
        catch (HttpRequestException)
        {
            return false;
        }
    }

    public static Task<string> HealthBodyAsync(int port) => PageAsync(port, "/healthz");

    /// <summary>The body of a dashboard path of the worker on <paramref name="port"/>, whatever its status.</summary>
    public static async Task<string> PageAsync(int port, string path)
    {
        using var response = await Http.GetAsync(new Uri($"http://127.0.0.1:{port}{path}"));
        return await response.Content.ReadAsStringAsync();
    }

    /// <summary>Reads of <see cref="SlowView"/> that started sleeping less than half a second ago (a check well inside its pause).</summary>
    public async Task<long> FreshSleepingQueriesAsync()
    {
        var name = new NpgsqlConnectionStringBuilder(Source.ConnectionString).Database!;
        await using var connection = new NpgsqlConnection(_server.AdminConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(
            """
            SELECT count(*) FROM pg_stat_activity WHERE datname = @db AND state = 'active' AND query ILIKE '%slow_loads%'
              AND query_start > now() - interval '0.5 seconds' AND pid <> pg_backend_pid()
            """, connection);
        command.Parameters.AddWithValue("db", name);
        return (long)(await command.ExecuteScalarAsync())!;
    }

    /// <summary>Every run of <paramref name="pair"/> with the slot it was for (null for runs without one), in store order.</summary>
    public async Task<IReadOnlyList<SlotRun>> SlotRunsAsync(string pair)
    {
        var rows = new List<SlotRun>();
        await using var connection = new NpgsqlConnection(Store.ConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand("SELECT id, slot_at_ms, status FROM runs WHERE pair = @pair ORDER BY id", connection);
        command.Parameters.AddWithValue("pair", pair);
        await using var reader = await command.ExecuteReaderAsync();
        while (await reader.ReadAsync())
        {
            rows.Add(new SlotRun(reader.GetInt64(0), reader.IsDBNull(1) ? null : reader.GetInt64(1), reader.GetString(2)));
        }

        return rows;
    }

    /// <summary>The Quartz instance (our worker instance id) executing <paramref name="pair"/>'s check now, read from qrtz_fired_triggers.</summary>
    public async Task<string?> ExecutingInstanceAsync(string pair)
    {
        await using var connection = new NpgsqlConnection(Store.ConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(
            "SELECT instance_name FROM qrtz_fired_triggers WHERE job_name = @pair AND job_group = 'pairs' AND lower(state) = 'executing' LIMIT 1", connection);
        command.Parameters.AddWithValue("pair", pair);
        return await command.ExecuteScalarAsync() as string;
    }

    /// <summary>The open alerts of <paramref name="pair"/> of <paramref name="kind"/> (store text, e.g. sign_flip).</summary>
    public async Task<IReadOnlyList<StreakAlert>> AlertsOfKindAsync(string pair, string kind)
    {
        var rows = new List<StreakAlert>();
        await using var connection = new NpgsqlConnection(Store.ConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(
            "SELECT id, status, consecutive_runs, last_run_id FROM alerts WHERE pair = @pair AND kind = @kind ORDER BY id", connection);
        command.Parameters.AddWithValue("pair", pair);
        command.Parameters.AddWithValue("kind", kind);
        await using var reader = await command.ExecuteReaderAsync();
        while (await reader.ReadAsync())
        {
            rows.Add(new StreakAlert(reader.GetInt64(0), reader.GetString(1), reader.GetInt32(2), reader.IsDBNull(3) ? null : reader.GetInt64(3)));
        }

        return rows;
    }

    /// <summary>Runs of <paramref name="pair"/> up to <paramref name="lastRunId"/> that carry a finding of <paramref name="kind"/>.</summary>
    public async Task<long> RunsWithFindingAsync(string pair, string kind, long lastRunId)
    {
        await using var connection = new NpgsqlConnection(Store.ConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(
            "SELECT count(DISTINCT run_id) FROM findings WHERE pair = @pair AND kind = @kind AND run_id <= @last", connection);
        command.Parameters.AddWithValue("pair", pair);
        command.Parameters.AddWithValue("kind", kind);
        command.Parameters.AddWithValue("last", lastRunId);
        return (long)(await command.ExecuteScalarAsync())!;
    }
}

public sealed record SlotRun(long Id, long? SlotAtMs, string Status);

public sealed record StreakAlert(long Id, string Status, int ConsecutiveRuns, long? LastRunId);
