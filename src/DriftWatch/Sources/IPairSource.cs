using DriftWatch.Core.Configuration;

namespace DriftWatch.Sources;

/// <summary>
/// Reads one watched pair from a source database, always through a read-only session.
/// Failures are thrown as <see cref="SourceException"/> with a message that is safe to log and store
/// (it names the pair, table and column, never the connection string).
/// </summary>
internal interface IPairSource
{
    SourceConfig Config { get; }

    /// <summary>Samples the pair and computes push-down figures over the whole window. <paramref name="now"/> anchors the window.</summary>
    Task<SampledPair> SampleAsync(PairConfig pair, DateTimeOffset now, CancellationToken cancellationToken);

    /// <summary>Connectivity, then that the table/query and both columns exist and are numeric.</summary>
    Task ValidateAsync(PairConfig pair, CancellationToken cancellationToken);
}
