using DriftWatch.Core.Configuration;
using DriftWatch.Hosting;
using DriftWatch.Sources;
using Microsoft.Extensions.Logging;

namespace DriftWatch.Monitoring;

/// <summary>
/// Checks the pairs of one table together: pairs that read the same source, table (or query), filter, window and
/// sampling settings share one read (<see cref="IGroupSource"/>: one aggregate scan, one sample), and each pair's
/// run is then recorded as its own check would record it. A pair whose source cannot read groups, or that the
/// shared read leaves out, is checked alone; when the shared read fails as a whole, every pair of the group is
/// checked alone, and the log says so.
/// </summary>
internal sealed class TableGroups(PairChecker checker, ISourceFactory sources, DriftWatchConfig config, TimeProvider time, ILogger<TableGroups> logger, LiveConfig? live = null)
{
    /// <summary>The most pairs one shared statement carries.</summary>
    public const int MaxPairs = 100;

    /// <summary>The most distinct columns one shared statement carries (PostgreSQL allows 1,664 output columns; each column and each pair is one).</summary>
    public const int MaxColumns = 200;

    /// <summary>What pairs must have in common to share a read; null when the pair's source reads pairs only one at a time.</summary>
    public object? KeyOf(PairConfig pair)
    {
        ArgumentNullException.ThrowIfNull(pair);
        var source = Config.FindSource(pair.Source);
        // A window anchored on the newest load is found per pair (with its own repeat check), so such pairs read alone.
        if (pair.Window is { Anchor: WindowAnchor.Latest })
        {
            return null;
        }

        return source?.Kind == SourceKind.Postgres ? new GroupKey(source.Name, pair.Table?.Trim(), pair.Query?.Trim(), pair.Where?.Trim(), pair.Window, pair.Sample) : null;
    }

    /// <summary>
    /// The pairs split into groups that share a read, in the order their first pair appears; a group holds at most
    /// <see cref="MaxPairs"/> pairs and <see cref="MaxColumns"/> columns. A pair that cannot share is a group of one.
    /// </summary>
    public IReadOnlyList<IReadOnlyList<PairConfig>> Split(IEnumerable<PairConfig> pairs)
    {
        ArgumentNullException.ThrowIfNull(pairs);
        var groups = new List<List<PairConfig>>();
        var open = new Dictionary<object, List<PairConfig>>();
        foreach (var pair in pairs)
        {
            var key = KeyOf(pair);
            if (key is null)
            {
                groups.Add([pair]);
                continue;
            }

            if (!open.TryGetValue(key, out var group) || !Fits(group, pair))
            {
                group = [];
                open[key] = group;
                groups.Add(group);
            }

            group.Add(pair);
        }

        return groups;
    }

    /// <summary>Whether <paramref name="pair"/> may join <paramref name="group"/> within the bounds of one statement.</summary>
    public static bool Fits(IReadOnlyCollection<PairConfig> group, PairConfig pair)
    {
        ArgumentNullException.ThrowIfNull(group);
        ArgumentNullException.ThrowIfNull(pair);
        return group.Count < MaxPairs && group.SelectMany(p => new[] { p.X, p.Y }).Append(pair.X).Append(pair.Y).Distinct(StringComparer.Ordinal).Count() <= MaxColumns;
    }

    /// <summary>Checks one group (from <see cref="Split"/>); results in the group's order.</summary>
    public Task<IReadOnlyList<PairCheckResult>> CheckAsync(IReadOnlyList<PairConfig> group, CancellationToken cancellationToken) =>
        CheckAsync(group, slot: null, cancellationToken);

    /// <summary>As above, for a schedule slot: each run records the <paramref name="slot"/> it was for.</summary>
    public async Task<IReadOnlyList<PairCheckResult>> CheckAsync(IReadOnlyList<PairConfig> group, DateTimeOffset? slot, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(group);
        var reads = group.Count > 1 ? await ReadAsync(group, cancellationToken) : null;
        var results = new PairCheckResult[group.Count];
        for (var i = 0; i < group.Count; i++)
        {
            results[i] = await checker.CheckSlotAsync(group[i], reads?[i], slot, cancellationToken);
            if (reads is not null)
            {
                // The pair's sample is recorded: let it go before the next pair's is taken out.
                reads[i] = null;
            }
        }

        return results;
    }

    private DriftWatchConfig Config => live?.Current ?? config;

    /// <summary>The group's shared read, one entry per pair (null: checked alone); null when there is none.</summary>
    private async Task<SharedRead?[]?> ReadAsync(IReadOnlyList<PairConfig> group, CancellationToken cancellationToken)
    {
        if (Config.FindSource(group[0].Source) is not { } source || sources.Create(source) is not IGroupSource reader)
        {
            return null;
        }

        var startedAt = time.GetUtcNow();
        try
        {
            var read = await reader.SampleGroupAsync(group, startedAt, cancellationToken);
            var shared = read.Select(r => r is null ? null : new SharedRead(startedAt, r)).ToArray();
            var alone = group.Where((_, i) => shared[i] is null).Select(p => p.Name).ToList();
            logger.LogDebug("Shared read of {Count} pairs of {Target} in {ElapsedMs} ms", group.Count, Describe(group[0]), (long)(time.GetUtcNow() - startedAt).TotalMilliseconds);
            if (alone.Count > 0)
            {
                logger.LogInformation("Shared read of {Target}: {Pairs} checked alone (a column that is not a number, or figures the shared sums cannot give to full precision)", Describe(group[0]), string.Join(", ", alone));
            }

            return shared;
        }
        catch (OperationCanceledException) when (cancellationToken.IsCancellationRequested)
        {
            // Each pair's check then records its own cancellation.
            return null;
        }
#pragma warning disable CA1031 // The shared read's failure must not fail its pairs: each is checked alone and records its own outcome.
        catch (Exception ex)
#pragma warning restore CA1031
        {
            logger.LogWarning("Shared read of {Count} pairs of {Target} failed, checking them one by one: {Error}", group.Count, Describe(group[0]), ex.Message);
            return null;
        }
    }

    private static string Describe(PairConfig pair) =>
        $"source {pair.Source}, {(pair.Table is not null ? "table " + pair.Table : "query")}{(pair.Where is null ? string.Empty : " where " + pair.Where)}";

    private sealed record GroupKey(string Source, string? Table, string? Query, string? Where, WindowSpec? Window, SampleSpec Sample);
}
