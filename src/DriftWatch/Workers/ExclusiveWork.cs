using System.Data.Common;
using DriftWatch.Core.Configuration;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Workers;

/// <summary>
/// Work that one worker at a time may do on the store (alert evaluation, store maintenance), under a lease in
/// worker_leases. The lease lasts <see cref="WorkerConfig.TakeoverAfter"/> and is renewed every heartbeat while the
/// work runs; if a renewal finds the lease gone, the work is cancelled rather than run beside its new holder. A
/// worker that dies holding the lease holds it no longer than its expiry.
/// </summary>
internal sealed class ExclusiveWork(WorkerLeases leases, WorkerIdentity identity, DriftWatchConfig config, TimeProvider time, ILogger<ExclusiveWork> logger)
{
    public const string AlertEvaluation = "alert-evaluation";
    public const string StoreMaintenance = "store-maintenance";

    /// <summary>Runs <paramref name="work"/> under the lease <paramref name="name"/>; false when another worker holds it.</summary>
    public async Task<bool> TryRunAsync(string name, Func<CancellationToken, Task> work, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(work);
        var ttl = config.Worker.TakeoverAfter;
        if (!await leases.TryAcquireAsync(name, identity.Id, time.GetUtcNow(), ttl, cancellationToken))
        {
            logger.LogDebug("{Lease} is held by another worker; this worker leaves it to that one", name);
            return false;
        }

        using var lost = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        using var stopRenewing = new CancellationTokenSource();
        var renewing = RenewAsync(name, ttl, lost, stopRenewing.Token);
        try
        {
            await work(lost.Token);
        }
        finally
        {
            await stopRenewing.CancelAsync();
            await renewing;
            try
            {
                await leases.ReleaseAsync(name, identity.Id, CancellationToken.None);
            }
            catch (Exception ex) when (ex is DbException or IOException or TimeoutException or System.Net.Sockets.SocketException)
            {
                // Not released: it runs out at its expiry.
                logger.LogDebug("Could not release {Lease}: {Error}", name, ex.Message);
            }
        }

        return true;
    }

    private async Task RenewAsync(string name, TimeSpan ttl, CancellationTokenSource lost, CancellationToken stop)
    {
        using var timer = new PeriodicTimer(config.Worker.Heartbeat, time);
        try
        {
            while (await timer.WaitForNextTickAsync(stop))
            {
                bool renewed;
                try
                {
                    renewed = await leases.RenewAsync(name, identity.Id, time.GetUtcNow(), ttl, stop);
                }
                catch (Exception ex) when (ex is DbException or IOException or TimeoutException or System.Net.Sockets.SocketException)
                {
                    // The store did not answer: the work cannot write either; try again next beat while the lease lasts.
                    logger.LogWarning("Could not renew {Lease}: {Error}", name, ex.Message);
                    continue;
                }

                if (!renewed)
                {
                    logger.LogWarning("{Lease} ran out before the work finished and may be held by another worker; the work is cancelled", name);
                    await lost.CancelAsync();
                    return;
                }
            }
        }
        catch (OperationCanceledException) when (stop.IsCancellationRequested)
        {
            // The work is done.
        }
    }
}
