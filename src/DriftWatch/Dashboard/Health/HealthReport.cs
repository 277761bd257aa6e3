using System.Data.Common;
using DriftWatch.Store;

namespace DriftWatch.Dashboard.Health;

/// <summary>The body of <c>/healthz</c>; snake_case in JSON.</summary>
internal sealed record HealthReport(string Status, DateTimeOffset CheckedAt, StoreHealth Store, SchedulerHealth Scheduler)
{
    /// <summary>Runs waiting for the store (the worker only; absent when no worker runs in this process).</summary>
    [System.Text.Json.Serialization.JsonIgnore(Condition = System.Text.Json.Serialization.JsonIgnoreCondition.WhenWritingNull)]
    public Spool.SpoolStatus? Spool { get; init; }

    /// <summary>The configuration in force and the last refused reload (the worker only).</summary>
    [System.Text.Json.Serialization.JsonIgnore(Condition = System.Text.Json.Serialization.JsonIgnoreCondition.WhenWritingNull)]
    public Hosting.ConfigStatus? Configuration { get; init; }

    /// <summary>The workers on this store (worker_instances); absent when the store cannot tell.</summary>
    [System.Text.Json.Serialization.JsonIgnore(Condition = System.Text.Json.Serialization.JsonIgnoreCondition.WhenWritingNull)]
    public WorkersHealth? Workers { get; init; }

    [System.Text.Json.Serialization.JsonIgnore]
    public bool Healthy => Status == "ok";
}

internal sealed record StoreHealth(bool Reachable, string? Error);

/// <param name="Checked">False when no scheduler runs in this process (nothing to ask).</param>
internal sealed record SchedulerHealth(bool Checked, bool? Running);

/// <summary>Healthy when the store answers within <see cref="StoreTimeout"/> and the scheduler (if any) runs.</summary>
/// A full spool is unhealthy too: runs are being lost.
internal sealed class HealthCheck(
    IHistoryStore history,
    TimeProvider time,
    IWorkerHealth? worker,
    IWorkerStatus? status = null,
    WorkerInstances? instances = null,
    TimeSpan? aliveWithin = null)
{
    public static readonly TimeSpan StoreTimeout = TimeSpan.FromSeconds(5);

    // A pair name no configuration can declare (names start with a letter or digit): the count is 0 and the
    // query runs on an index, so the probe is cheap yet goes through the real connection, schema and table.
    private const string ProbePair = "~healthz-probe";

    public async Task<HealthReport> CheckAsync(CancellationToken cancellationToken)
    {
        var store = await CheckStoreAsync(cancellationToken);
        bool? running = null;
        if (worker is not null)
        {
            try
            {
                running = worker.IsSchedulerRunning;
            }
            catch (InvalidOperationException)
            {
                // A scheduler being torn down may throw from its state query; that is "not running".
                running = false;
            }
        }

        var spool = status?.Spool;
        var healthy = store.Reachable && running != false && spool is not { Full: true };
        return new HealthReport(healthy ? "ok" : "unhealthy", time.GetUtcNow(), store, new SchedulerHealth(worker is not null, running))
        {
            Spool = spool,
            Configuration = status?.Configuration,
            Workers = store.Reachable ? await WorkersAsync(cancellationToken) : null,
        };
    }

    /// <summary>The workers on this store (also the overview page's small table); null when the store cannot tell.</summary>
    public async Task<WorkersHealth?> WorkersAsync(CancellationToken cancellationToken)
    {
        if (instances is null)
        {
            return null;
        }

        try
        {
            var rows = await instances.ListAsync(cancellationToken);
            return WorkersHealth.Of(rows, time.GetUtcNow(), aliveWithin ?? Core.Configuration.WorkerConfig.DefaultTakeoverAfter);
        }
        catch (DbException)
        {
            // A store not yet migrated to 010 (a dashboard served alone on an old store) has no workers table.
            return null;
        }
    }

    private async Task<StoreHealth> CheckStoreAsync(CancellationToken cancellationToken)
    {
        using var timeout = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        timeout.CancelAfter(StoreTimeout);
        try
        {
            await history.CountRunsAsync(ProbePair, timeout.Token);
            return new StoreHealth(true, null);
        }
        catch (OperationCanceledException) when (!cancellationToken.IsCancellationRequested)
        {
            return new StoreHealth(false, $"the store did not answer within {StoreTimeout.TotalSeconds:0} s");
        }
        catch (Exception ex) when (ex is DbException or IOException or InvalidOperationException or TimeoutException or System.Net.Sockets.SocketException)
        {
            // The message names what failed (connection refused, no such table); connection strings are not in it.
            return new StoreHealth(false, ex.GetType().Name + ": " + ex.Message);
        }
    }
}
