using System.Data.Common;
using DriftWatch.Core.Configuration;
using DriftWatch.Hosting;
using DriftWatch.Store;
using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Workers;

/// <summary>
/// Writes this worker's row in worker_instances every <see cref="WorkerConfig.Heartbeat"/> and reads the others':
/// a worker with its own in-memory schedule (a SQLite store, or shared_schedule off) says loudly when another worker
/// runs on the same store, since both then check every pair; workers sharing a schedule say when the live ones run
/// different configurations. A store that does not answer costs a warning, never the worker.
/// </summary>
internal sealed class HeartbeatService(
    DriftWatchConfig config,
    WorkerIdentity identity,
    WorkerInstances instances,
    LiveConfig live,
    LastCheck lastCheck,
    TimeProvider time,
    ILogger<HeartbeatService> logger) : BackgroundService
{
    private readonly HashSet<string> _warnedAbout = new(StringComparer.Ordinal);
    private string? _warnedHashes;
    private bool _storeWarned;

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        using var timer = new PeriodicTimer(config.Worker.Heartbeat, time);
        do
        {
            await BeatOnceAsync(stoppingToken);
        }
        while (await timer.WaitForNextTickAsync(stoppingToken));
    }

    public override async Task StopAsync(CancellationToken cancellationToken)
    {
        await base.StopAsync(cancellationToken);
        try
        {
            await instances.RemoveAsync(identity.Id, cancellationToken);
        }
        catch (Exception ex) when (ex is DbException or IOException or TimeoutException or OperationCanceledException or System.Net.Sockets.SocketException)
        {
            // The row then ages out like a crashed worker's.
            logger.LogDebug("Could not remove this worker's row from worker_instances: {Error}", ex.Message);
        }
    }

    internal async Task BeatOnceAsync(CancellationToken cancellationToken)
    {
        try
        {
            var now = time.GetUtcNow();
            var last = lastCheck.Current;
            await instances.BeatAsync(
                new WorkerInstance(identity.Id, identity.Host, identity.Pid, identity.StartedAt, now, live.Status.Sha256, config.Worker.SharedSchedule, last?.Pair, last?.At),
                cancellationToken);
            var alive = (await instances.ListAsync(cancellationToken)).Where(i => now - i.LastSeenAt <= config.Worker.TakeoverAfter).ToList();
            WarnAboutOthers(alive);
            _storeWarned = false;
        }
        catch (Exception ex) when (ex is DbException or IOException or TimeoutException or System.Net.Sockets.SocketException or InvalidOperationException)
        {
            if (!_storeWarned)
            {
                _storeWarned = true;
                logger.LogWarning("The worker's heartbeat could not be written to the store: {Error}", ex.Message);
            }
        }
    }

    private void WarnAboutOthers(IReadOnlyList<WorkerInstance> alive)
    {
        if (!config.Worker.SharedSchedule)
        {
            foreach (var other in alive.Where(i => i.Id != identity.Id && _warnedAbout.Add(i.Id)))
            {
                logger.LogWarning(
                    "Another worker runs on this store ({OtherId} on {OtherHost}, pid {OtherPid}, started {OtherStarted:u}). This worker keeps its own schedule in memory{Why}, so both check every pair; stop one of them{Remedy}",
                    other.Id, other.Host, other.Pid, other.StartedAt,
                    config.Store.Kind == StoreKind.Sqlite ? " (a SQLite store serves one worker)" : " (worker.shared_schedule is off)",
                    config.Store.Kind == StoreKind.Sqlite ? ", or move the store to PostgreSQL and set worker.shared_schedule: true" : ", or set worker.shared_schedule: true on every worker");
            }

            return;
        }

        var hashes = alive.Select(i => i.ConfigSha256).Distinct(StringComparer.Ordinal).Order(StringComparer.Ordinal).ToList();
        var key = string.Join(',', hashes);
        if (hashes.Count > 1 && key != _warnedHashes)
        {
            logger.LogWarning(
                "The workers sharing this schedule run different configurations ({Workers}); a pair known to one worker only is skipped when another takes its slot. Give every worker the same file",
                string.Join(", ", alive.Select(i => $"{i.Id}: {i.ConfigSha256[..Math.Min(12, i.ConfigSha256.Length)]}")));
        }

        _warnedHashes = hashes.Count > 1 ? key : null;
    }
}
