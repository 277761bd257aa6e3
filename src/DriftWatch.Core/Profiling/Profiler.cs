using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Profiling;

/// <summary>Computes the <see cref="RelationshipProfile"/> of one extract of a pair.</summary>
public static class Profiler
{
    /// <summary>
    /// Profiles the usable rows of <paramref name="sample"/>. Never throws for data: undefined figures
    /// are null (fewer than 3 rows, a constant column) and the shape reason says why.
    /// </summary>
    public static RelationshipProfile Profile(PairedSample sample, Thresholds thresholds)
    {
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(thresholds);
        var rows = UsableRows.Of(sample);
        var counts = new RelationshipProfile
        {
            NRows = sample.RowCount,
            NUsed = rows.X.Length,
            NNull = sample.NullCount,
            NNonfinite = sample.NonFiniteCount + rows.DroppedNonFinite,
            NNonNumeric = sample.NonNumericCount,
        };

        return ProfileComputation.Run(rows.X, rows.Y, counts, thresholds);
    }
}
