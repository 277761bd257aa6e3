using DriftWatch.Core.Configuration;

namespace DriftWatch.Monitoring;

/// <summary>
/// Checks several pairs now (the <c>check</c> command, the demo). Pairs run concurrently up to
/// <see cref="MaxParallelChecks"/>; each source adapter further limits its own concurrent queries. With
/// <paramref name="groups"/>, the pairs of one table share one read (<see cref="TableGroups"/>) and the groups
/// run concurrently instead.
/// </summary>
internal sealed class MonitorCycle(PairChecker checker, TableGroups? groups = null)
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
        // A back-dated check reads each pair on its own: shared reads are for checks of now.
        if (groups is not null && asOf is null)
        {
            return await RunGroupedAsync(groups, pairs, progress, cancellationToken);
        }

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

    private static async Task<IReadOnlyList<PairCheckResult>> RunGroupedAsync(
        TableGroups groups, IReadOnlyList<PairConfig> pairs, IProgress<PairCheckResult>? progress, CancellationToken cancellationToken)
    {
        var split = groups.Split(pairs);
        var results = new Dictionary<PairConfig, PairCheckResult>(ReferenceEqualityComparer.Instance);
        await Parallel.ForEachAsync(
            split,
            new ParallelOptions { MaxDegreeOfParallelism = MaxParallelChecks, CancellationToken = cancellationToken },
            async (group, ct) =>
            {
                foreach (var result in await groups.CheckAsync(group, ct))
                {
                    lock (results)
                    {
                        results[result.Pair] = result;
                    }

                    progress?.Report(result);
                }
            });
        return [.. pairs.Select(p => results[p])];
    }
}
