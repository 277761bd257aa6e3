using System.Net.Http;
using System.Text.Json;
using Npgsql;

namespace DriftWatch.FaultTests.Infrastructure;

/// <summary>What the running worker tells about itself (/healthz, its spool folder) and the runs as the store keeps them.</summary>
public sealed partial class FaultBench
{
    /// <summary>The worker's default spool folder: <c>driftwatch-spool</c> beside the configuration file.</summary>
    public string SpoolFolder => Path.Combine(Folder, "driftwatch-spool");

    /// <summary>
    /// The body of /healthz whatever its status (503 while the store is down still carries the spool and the
    /// configuration); null when the worker does not answer at all.
    /// </summary>
    public async Task<JsonElement?> HealthReportAsync(CancellationToken cancellationToken = default)
    {
        try
        {
            using var response = await Http.GetAsync(new Uri($"http://127.0.0.1:{DashboardPort}/healthz"), cancellationToken);
            var body = await response.Content.ReadAsStringAsync(cancellationToken);
            using var document = JsonDocument.Parse(body);
            return document.RootElement.Clone();
        }
        catch (HttpRequestException)
        {
            return null;
        }
        catch (TaskCanceledException) when (!cancellationToken.IsCancellationRequested)
        {
            // The client's own timeout: the worker did not answer in time.
            return null;
        }
    }

    /// <summary>
    /// The run keys of the runs now waiting in the spool folder, read from the files themselves (format 1:
    /// <c>{"format":1,"run":{…,"run_key":…}}</c>). A file the worker is renaming or deleting as it is read is skipped.
    /// </summary>
    public IReadOnlyList<SpooledRun> SpooledRuns()
    {
        var runs = new List<SpooledRun>();
        var folder = Path.Combine(SpoolFolder, "runs");
        if (!Directory.Exists(folder))
        {
            return runs;
        }

        foreach (var file in Directory.EnumerateFiles(folder).Where(f => !f.EndsWith(".tmp", StringComparison.Ordinal)))
        {
            try
            {
                using var document = JsonDocument.Parse(File.ReadAllBytes(file));
                var run = document.RootElement.GetProperty("run");
                var findings = run.TryGetProperty("findings", out var list) && list.ValueKind == JsonValueKind.Array ? list.GetArrayLength() : 0;
                runs.Add(new SpooledRun(run.GetProperty("run_key").GetString()!, run.GetProperty("status").ToString(), findings));
            }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
            {
                // Gone between the listing and the read: the store took it.
            }
        }

        return runs;
    }

    /// <summary>Every run of <paramref name="pair"/> with its key, start time and number of findings, in store order.</summary>
    public async Task<IReadOnlyList<StoredRun>> StoredRunsAsync(string pair)
    {
        var rows = new List<StoredRun>();
        await using var connection = new NpgsqlConnection(Store.ConnectionString);
        await connection.OpenAsync();
        await using var command = new NpgsqlCommand(
            """
            SELECT r.id, r.run_key, r.started_at_ms, r.status, (SELECT count(*) FROM findings f WHERE f.run_id = r.id)
            FROM runs r WHERE r.pair = @pair ORDER BY r.id
            """, connection);
        command.Parameters.AddWithValue("pair", pair);
        await using var reader = await command.ExecuteReaderAsync();
        while (await reader.ReadAsync())
        {
            rows.Add(new StoredRun(reader.GetInt64(0), reader.IsDBNull(1) ? null : reader.GetString(1), reader.GetInt64(2), reader.GetString(3), reader.GetInt64(4)));
        }

        return rows;
    }
}

public sealed record SpooledRun(string RunKey, string Status, int Findings);

public sealed record StoredRun(long Id, string? RunKey, long StartedAtMs, string Status, long Findings);
