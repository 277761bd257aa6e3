using DriftWatch.Core.Configuration;

namespace DriftWatch.Sources;

/// <summary>
/// A source that can read several pairs of one table (or query) in one go: one exact aggregate scan for all of
/// them and one sample carrying all their columns. The pairs must share table, query, filter, window and
/// sampling settings (<see cref="Monitoring.TableGroups"/> forms such groups).
/// </summary>
internal interface IGroupSource
{
    /// <summary>
    /// One entry per pair, in order: what <see cref="IPairSource.SampleAsync"/> of that pair alone would give, or
    /// null when the pair must be read alone (a column that is not a number, figures the shared sums cannot give
    /// to full precision). Each pair's sample is taken out of the shared rows only when asked for, so a group of
    /// 100 pairs holds one table of sampled columns rather than 100 samples. Throws
    /// <see cref="SourceException"/> when the shared read fails as a whole.
    /// </summary>
    Task<IReadOnlyList<Lazy<SampledPair>?>> SampleGroupAsync(IReadOnlyList<PairConfig> pairs, DateTimeOffset now, CancellationToken cancellationToken);
}
