using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Alerting.Outbox;

/// <summary>
/// Runs the dispatcher in the worker: at start (its own claims from before a restart taken back first, then every
/// message due), after every cycle, and on a poll. Retention of sent messages is the maintenance job's
/// (Scheduling/StoreMaintenanceJob.cs), with every other table's.
/// </summary>
internal sealed class OutboxDispatchService(
    OutboxDispatcher dispatcher,
    OutboxSignal signal,
    OutboxOptions options,
    TimeProvider time,
    ILogger<OutboxDispatchService> logger) : BackgroundService
{
    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        var tookBack = false;
        while (!stoppingToken.IsCancellationRequested)
        {
            try
            {
                if (!tookBack)
                {
                    // Before the first claim: what this worker held when it last stopped is sent now, not after its lease.
                    await dispatcher.TakeBackOwnClaimsAsync(stoppingToken);
                    tookBack = true;
                }

                await dispatcher.DispatchDueAsync(stoppingToken);
            }
            catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
            {
                return;
            }
            catch (Exception ex)
            {
                // The store may be briefly unreachable; the next pass tries again, the outbox keeps everything.
                logger.LogError(ex, "Outbox dispatch failed; retrying in {Interval}", options.PollInterval);
            }

            try
            {
                await signal.WaitAsync(options.PollInterval, time, stoppingToken);
            }
            catch (OperationCanceledException)
            {
                return;
            }
        }
    }
}
