using System.Globalization;
using System.Text;
using Dapper;
using DriftWatch.Core.Configuration;
using DriftWatch.Core.Findings;
using DriftWatch.Output;
using DriftWatch.Store;

namespace DriftWatch.Dashboard.Metrics;

/// <summary>
/// <c>/metrics</c>, computed from the store at scrape time rather than counted in-process, so checks written
/// by any worker instance sharing the store are counted and a dashboard restart loses nothing it could know.
/// <list type="bullet">
/// <item><c>driftwatch_runs_total{pair,status}</c>: runs recorded since this process first answered a scrape
/// (its <c>_created</c>). Counting every stored run instead would fall when retention prunes old runs, and an
/// OpenMetrics counter must not decrease except by a reset to 0.</item>
/// <item><c>driftwatch_open_alerts{severity}</c>: open (watching or confirmed) alerts now, a gauge.</item>
/// <item><c>driftwatch_check_duration_seconds</c>: start-to-finish time of the same runs, a histogram.</item>
/// </list>
/// The aggregate is one SQL statement over the runs table (both dialects), because the history store's
/// interface has no aggregate query and loading every run would not scale.
/// </summary>
/// <item><c>driftwatch_spooled_runs</c>, <c>driftwatch_spool_bytes</c>, <c>driftwatch_spool_full</c> (gauges) and
/// <c>driftwatch_spool_dropped_runs_total</c> (counter): the worker's spool (<see cref="IWorkerStatus"/>), read in-process,
/// so they are served even while the store cannot be read (<see cref="RenderWorkerOnly"/>).</item>
internal sealed class DashboardMetrics(IStoreDatabase database, IAlertStore alerts, DriftWatchConfig config, TimeProvider time, IWorkerStatus? worker = null)
{
    /// <summary>True when this process runs the worker, whose own figures can be served without the store.</summary>
    public bool HasWorker => worker is not null;

    /// <summary>Upper bounds in seconds; fixed, since buckets that change between scrapes break aggregation (spec).</summary>
    public static readonly double[] DurationBuckets = [0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30, 60, 120, 300];

    private static readonly string[] Statuses = [.. Enum.GetValues<Core.History.RunStatus>().Select(JsonContract.Name)];

    private Watermark? _watermark;

    public async Task<string> RenderAsync(CancellationToken cancellationToken)
    {
        var watermark = await GetWatermarkAsync(cancellationToken);
        var rows = await QueryRunsAsync(watermark.AfterRunId, cancellationToken);
        var open = await alerts.GetOpenAlertsAsync(null, cancellationToken);
        var created = OpenMetricsText.Float(watermark.At.ToUnixTimeMilliseconds() / 1000.0);

        var text = new OpenMetricsText();
        text.Family("driftwatch_runs", "counter", "Checks recorded in the store since this process started counting, by pair and outcome.");
        var counts = rows.ToDictionary(r => (r.Pair, r.Status), r => r.Runs);
        var pairs = config.Pairs.Select(p => p.Name).Concat(rows.Select(r => r.Pair)).Distinct(StringComparer.Ordinal).Order(StringComparer.Ordinal);
        foreach (var pair in pairs)
        {
            foreach (var status in Statuses)
            {
                // Every configured pair shows both outcomes from the first scrape on: series should not appear late.
                var labels = new[] { ("pair", pair), ("status", status) };
                text.Sample("driftwatch_runs_total", labels, OpenMetricsText.Integer(counts.GetValueOrDefault((pair, status))));
                text.Sample("driftwatch_runs_created", labels, created);
            }
        }

        text.Family("driftwatch_open_alerts", "gauge", "Open (watching or confirmed) alerts by severity.");
        foreach (var severity in Enum.GetValues<Severity>())
        {
            text.Sample("driftwatch_open_alerts", [("severity", JsonContract.Name(severity))], OpenMetricsText.Integer(open.Count(a => a.Severity == severity)));
        }

        text.Family("driftwatch_check_duration_seconds", "histogram", "Time from the start to the end of a check, over the runs counted above.", "seconds");
        for (var i = 0; i < DurationBuckets.Length; i++)
        {
            // Each bucket column already counts every run at or below its bound: cumulative, as the spec requires.
            var inBucket = rows.Sum(r => r.Buckets[i]);
            text.Sample("driftwatch_check_duration_seconds_bucket", [("le", OpenMetricsText.Bound(DurationBuckets[i]))], OpenMetricsText.Integer(inBucket));
        }

        var count = rows.Sum(r => r.Runs);
        text.Sample("driftwatch_check_duration_seconds_bucket", [("le", "+Inf")], OpenMetricsText.Integer(count));
        text.Sample("driftwatch_check_duration_seconds_count", [], OpenMetricsText.Integer(count));
        text.Sample("driftwatch_check_duration_seconds_sum", [], OpenMetricsText.Float(rows.Sum(r => r.TotalMs) / 1000.0));
        text.Sample("driftwatch_check_duration_seconds_created", [], created);
        AppendWorker(text);
        return text.Finish();
    }

    /// <summary>The worker's in-process figures alone: what /metrics serves while the store cannot be read.</summary>
    public string RenderWorkerOnly()
    {
        var text = new OpenMetricsText();
        AppendWorker(text);
        return text.Finish();
    }

    private void AppendWorker(OpenMetricsText text)
    {
        if (worker is null)
        {
            return;
        }

        var spool = worker.Spool;
        text.Family("driftwatch_spooled_runs", "gauge", "Finished runs waiting in the worker's local spool for the store to take them.");
        text.Sample("driftwatch_spooled_runs", [], OpenMetricsText.Integer(spool.Runs));
        text.Family("driftwatch_spool_bytes", "gauge", "Bytes the spooled runs take on disk.", "bytes");
        text.Sample("driftwatch_spool_bytes", [], OpenMetricsText.Integer(spool.Bytes));
        text.Family("driftwatch_spool_full", "gauge", "1 when the last run offered to the spool did not fit (runs are being lost), else 0.");
        text.Sample("driftwatch_spool_full", [], OpenMetricsText.Integer(spool.Full ? 1 : 0));
        text.Family("driftwatch_spool_dropped_runs", "counter", "Runs lost because the spool was full or could not be written, since the worker started.");
        text.Sample("driftwatch_spool_dropped_runs_total", [], OpenMetricsText.Integer(spool.DroppedRuns));
    }

    private async Task<Watermark> GetWatermarkAsync(CancellationToken cancellationToken)
    {
        if (_watermark is { } known)
        {
            return known;
        }

        await using var connection = await database.OpenAsync(cancellationToken);
        var maxId = await connection.ExecuteScalarAsync<long?>(new CommandDefinition("SELECT MAX(id) FROM runs", cancellationToken: cancellationToken));
        // Two first scrapes at once both read a watermark; the first stored one wins, so all later scrapes agree.
        Interlocked.CompareExchange(ref _watermark, new Watermark(maxId ?? 0, time.GetUtcNow()), null);
        return _watermark;
    }

    private async Task<IReadOnlyList<RunCounts>> QueryRunsAsync(long afterRunId, CancellationToken cancellationToken)
    {
        await using var connection = await database.OpenAsync(cancellationToken);
        var rows = await connection.QueryAsync(new CommandDefinition(RunCountsSql, new { after = afterRunId }, cancellationToken: cancellationToken));
        var result = new List<RunCounts>();
        foreach (IDictionary<string, object?> row in rows)
        {
            var buckets = new long[DurationBuckets.Length];
            for (var i = 0; i < buckets.Length; i++)
            {
                buckets[i] = Convert.ToInt64(row["le" + i.ToString(CultureInfo.InvariantCulture)], CultureInfo.InvariantCulture);
            }

            result.Add(new RunCounts(
                (string)row["pair"]!,
                (string)row["status"]!,
                Convert.ToInt64(row["runs"], CultureInfo.InvariantCulture),
                Convert.ToInt64(row["total_ms"], CultureInfo.InvariantCulture),
                buckets));
        }

        return result;
    }

    // One column per bucket bound (cumulative: duration <= bound). Bounds are our constants, not input.
    private static readonly string RunCountsSql = BuildSql();

    private static string BuildSql()
    {
        // A clock stepping back mid-check could make a duration negative; it counts as 0 (a histogram sum must not be negative).
        const string duration = "(CASE WHEN finished_at_ms > started_at_ms THEN finished_at_ms - started_at_ms ELSE 0 END)";
        var sql = new StringBuilder($"SELECT pair, status, CAST(COUNT(*) AS BIGINT) AS runs, CAST(COALESCE(SUM({duration}), 0) AS BIGINT) AS total_ms");
        for (var i = 0; i < DurationBuckets.Length; i++)
        {
            var ms = (long)Math.Round(DurationBuckets[i] * 1000);
            sql.Append(CultureInfo.InvariantCulture, $", CAST(SUM(CASE WHEN {duration} <= {ms} THEN 1 ELSE 0 END) AS BIGINT) AS le{i}");
        }

        return sql.Append(" FROM runs WHERE id > @after GROUP BY pair, status").ToString();
    }

    private sealed record Watermark(long AfterRunId, DateTimeOffset At);

    private sealed record RunCounts(string Pair, string Status, long Runs, long TotalMs, long[] Buckets);
}
