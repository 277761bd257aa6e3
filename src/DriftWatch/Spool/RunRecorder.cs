using DriftWatch.Core.History;
using DriftWatch.Store;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Spool;

/// <summary>
/// Where a finished check's run goes. In the worker (with a <see cref="RunSpool"/>): straight to the store while the
/// spool is empty, else behind the runs already waiting (so the store receives them in order), and to the spool
/// whenever the store cannot take it. One-shot commands have no spool: a store failure is logged and the run lost,
/// as the command's own output already reported it.
/// </summary>
internal sealed class RunRecorder(IHistoryStore store, ILogger<RunRecorder> logger, RunSpool? spool = null, CheckMarkers? markers = null)
{
    /// <summary>Leaves the check's start marker and returns the run's key (null without a spool).</summary>
    public string? Begin(string pair, DateTimeOffset startedAt)
    {
        if (spool is null)
        {
            return null;
        }

        var key = Guid.NewGuid().ToString("N");
        markers?.Leave(new CheckMarker(key, pair, startedAt));
        return key;
    }

    /// <summary>The run's store id, or 0 when it waits in the spool (or was lost: logged).</summary>
    public async Task<long> RecordAsync(NewRun run)
    {
        ArgumentNullException.ThrowIfNull(run);
        try
        {
            if (spool is null || spool.Count == 0)
            {
                try
                {
                    // The shutdown token is not passed: a finished check is worth one short write.
                    return await store.RecordRunAsync(run, CancellationToken.None);
                }
#pragma warning disable CA1031 // The store being down must not crash the worker: the run goes to the spool.
                catch (Exception ex)
#pragma warning restore CA1031
                {
                    if (spool is null)
                    {
                        logger.LogError(ex, "Could not record the run of {Pair} in the store", run.Pair);
                        return 0;
                    }

                    if (spool.TryAppend(run))
                    {
                        logger.LogWarning("The store cannot take the run of {Pair} ({Error}); it waits in the spool ({Runs} runs) and is written when the store answers", run.Pair, ex.Message, spool.Count);
                    }

                    return 0;
                }
            }

            // Runs are already waiting: this one goes behind them, so the store receives every pair's runs in order.
            spool.TryAppend(run);
            return 0;
        }
        finally
        {
            if (run.RunKey is { } key)
            {
                // In the store, in the spool, or lost and said so: either way no longer a check in progress.
                markers?.Clear(key);
            }
        }
    }
}
