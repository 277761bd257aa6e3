using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;

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

    /// <summary>How many rows <see cref="FarthestFromLineAsync"/> returns unless asked otherwise.</summary>
    const int DefaultDrivingRows = 5;

    /// <summary>The most rows <see cref="FarthestFromLineAsync"/> returns: a handful to show, never an extract.</summary>
    const int MaxDrivingRows = 10;

    /// <summary>
    /// The <paramref name="count"/> (1 to <see cref="MaxDrivingRows"/>) rows of the pair's window and filter
    /// farthest from y = <paramref name="intercept"/> + <paramref name="slope"/>·x, by |y − (a + b·x)|
    /// descending, computed in the database in one scan over the finite rows; fewer when the window holds
    /// fewer. Same read-only session, statement timeout, concurrency limit and failures as <see cref="SampleAsync"/>.
    /// </summary>
    Task<IReadOnlyList<DrivingRow>> FarthestFromLineAsync(
        PairConfig pair, DateTimeOffset now, double intercept, double slope, int count, CancellationToken cancellationToken);

    /// <summary>Connectivity, then that the table/query and both columns exist and are numeric.</summary>
    Task ValidateAsync(PairConfig pair, CancellationToken cancellationToken);
}
