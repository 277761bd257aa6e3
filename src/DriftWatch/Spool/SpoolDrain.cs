using DriftWatch.Store;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Spool;

/// <summary>
/// Writes spooled runs to the store, oldest first, deleting each file once the store holds its run. A crash between
/// the two writes the run again at the next drain, and the store keeps it once (its <c>run_key</c>). Stops at the
/// first store failure so the order holds; alert evaluation then reads the runs through the run feed like any other.
/// </summary>
internal sealed class SpoolDrain(RunSpool spool, IHistoryStore store, ILogger<SpoolDrain> logger) : IDisposable
{
    private readonly SemaphoreSlim _gate = new(1, 1);

    /// <summary>How many runs reached the store.</summary>
    public async Task<int> DrainAsync(CancellationToken cancellationToken)
    {
        await _gate.WaitAsync(cancellationToken);
        try
        {
            var written = 0;
            while (spool.Peek() is { } entry)
            {
                try
                {
                    await store.RecordRunAsync(entry.Run, cancellationToken);
                }
                catch (OperationCanceledException) when (cancellationToken.IsCancellationRequested)
                {
                    throw;
                }
#pragma warning disable CA1031 // Any store failure ends this drain; the run stays first in line for the next one.
                catch (Exception ex)
#pragma warning restore CA1031
                {
                    logger.LogWarning("The store still cannot take spooled runs ({Runs} waiting): {Error}", spool.Count, ex.Message);
                    break;
                }

                spool.Remove(entry);
                written++;
            }

            if (written > 0)
            {
                logger.LogInformation("Wrote {Runs} spooled runs to the store; {Left} still waiting", written, spool.Count);
            }

            return written;
        }
        finally
        {
            _gate.Release();
        }
    }

    public void Dispose() => _gate.Dispose();
}
