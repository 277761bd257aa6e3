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

    /// <summary>
    /// Samples the pair and computes push-down figures over the whole window. <paramref name="now"/> is the check time
    /// (or the <c>--as-of</c> time): the window's end with anchor <c>now</c>, the latest value's upper limit with anchor
    /// <c>latest</c> (see <see cref="WindowRange"/>); <see cref="SampledPair.WindowEnd"/> says where it ended.
    /// </summary>
    Task<SampledPair> SampleAsync(PairConfig pair, DateTimeOffset now, CancellationToken cancellationToken);

    /// <summary>
    /// The newest value of the pair's window column at or before <paramref name="at"/>, within the pair's filter,
    /// computed in the database (same read-only session and statement timeout as <see cref="SampleAsync"/>); null when
    /// there is none or the pair has no window. Anchor <c>latest</c> ends the window there.
    /// </summary>
    Task<DateTimeOffset?> LatestAsync(PairConfig pair, DateTimeOffset at, CancellationToken cancellationToken);

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
