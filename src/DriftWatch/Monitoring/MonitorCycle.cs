using DriftWatch.Core.Configuration;

namespace DriftWatch.Monitoring;

/// <summary>
/// Checks several pairs now (the <c>check</c> command, the demo). Pairs run concurrently up to
/// <see cref="MaxParallelChecks"/>; each source adapter further limits its own concurrent queries.
/// </summary>
internal sealed class MonitorCycle(PairChecker checker)
{
    public const int MaxParallelChecks = 8;

    public Task<IReadOnlyList<PairCheckResult>> RunAsync(
        IReadOnlyList<PairConfig> pairs,
        IProgress<PairCheckResult>? progress,
        CancellationToken cancellationToken) => RunAsync(pairs, progress, null, cancellationToken);

    /// <param name="asOf">Check as of this past time (see <see cref="PairChecker.CheckAsync(PairConfig, DateTimeOffset?, CancellationToken)"/>).</param>
    public async Task<IReadOnlyList<PairCheckResult>> RunAsync(
        IReadOnlyList<PairConfig> pairs,
        IProgress<PairCheckResult>? progress,
        DateTimeOffset? asOf,
        CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(pairs);
        var results = new PairCheckResult[pairs.Count];
        await Parallel.ForEachAsync(
            Enumerable.Range(0, pairs.Count),
            new ParallelOptions { MaxDegreeOfParallelism = MaxParallelChecks, CancellationToken = cancellationToken },
            async (i, ct) =>
            {
                results[i] = await checker.CheckAsync(pairs[i], asOf, ct);
                progress?.Report(results[i]);
            });
        return results;
    }
}
