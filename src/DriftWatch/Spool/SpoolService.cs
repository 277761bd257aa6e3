using Microsoft.Extensions.Hosting;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Spool;

/// <summary>
/// The worker's side of the spool. At start, before the scheduler runs a check: every start marker left by the
/// previous process becomes an interrupted run (queued in the spool, so it reaches the store in order even when the
/// store is down now), then the spool is drained. After that it drains every <see cref="DrainEvery"/>.
/// </summary>
internal sealed class SpoolService(RunSpool spool, CheckMarkers markers, SpoolDrain drain, TimeProvider time, ILogger<SpoolService> logger) : BackgroundService
{
    /// <summary>How soon after the store comes back the waiting runs are written.</summary>
    public static readonly TimeSpan DrainEvery = TimeSpan.FromSeconds(5);

    public override async Task StartAsync(CancellationToken cancellationToken)
    {
        foreach (var marker in markers.Left())
        {
            if (spool.TryAppend(InterruptedRuns.From(marker, time.GetUtcNow())))
            {
                logger.LogWarning("The check of {Pair} started {StartedAt:u} was cut off (the worker stopped or crashed); it is recorded as interrupted", marker.Pair, marker.StartedAt);
            }

            markers.Remove(marker);
        }

        await drain.DrainAsync(cancellationToken);
        await base.StartAsync(cancellationToken);
    }

    protected override async Task ExecuteAsync(CancellationToken stoppingToken)
    {
        using var timer = new PeriodicTimer(DrainEvery, time);
        try
        {
            while (await timer.WaitForNextTickAsync(stoppingToken))
            {
                if (spool.Count > 0)
                {
                    await drain.DrainAsync(stoppingToken);
                }
            }
        }
        catch (OperationCanceledException) when (stoppingToken.IsCancellationRequested)
        {
            // Stopping: what is still spooled waits for the next start.
        }
    }
}
