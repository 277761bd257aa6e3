using DriftWatch.Core.History;
using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Profiling;

/// <summary>
/// Whether a profile measured anything at all. A window with no rows, too few usable rows or a constant column
/// has no correlation, no line and nothing to compare: calling it "ok" would let an empty load pass as health
/// and close alerts. Such a check ends <see cref="RunStatus.Unmeasurable"/> with the sentence returned here.
/// </summary>
public static class Measurability
{
    /// <summary>
    /// Null when the profile can be measured; otherwise why not, naming the columns. Row counts come from the
    /// exact whole-window <paramref name="figures"/> when the source computed them, else from the sample.
    /// The usable-row minimum and the constant tests apply to the sample, which is what the figures are computed on.
    /// </summary>
    public static string? Assess(RelationshipProfile profile, SourceFigures? figures, Thresholds thresholds, string? x, string? y)
    {
        ArgumentNullException.ThrowIfNull(profile);
        ArgumentNullException.ThrowIfNull(thresholds);
        var xName = string.IsNullOrWhiteSpace(x) ? "x" : x;
        var yName = string.IsNullOrWhiteSpace(y) ? "y" : y;

        long rows = figures?.RowCount ?? profile.NRows;
        if (rows == 0)
        {
            return $"No rows in the window: there is nothing to measure of {yName} against {xName}.";
        }

        if (profile.NRows == 0)
        {
            return $"The sample drew no rows of the {Rows(rows)} in the window: there is nothing to measure of {yName} against {xName}.";
        }

        if (profile.NUsed == 0)
        {
            long nulls = figures?.NullCount ?? profile.NNull;
            return $"{Rows(rows)} in the window but none usable: {Numbers.Count(nulls)} with {xName} or {yName} null" +
                (profile.NNonfinite > 0 ? $", {Numbers.Count(profile.NNonfinite)} not finite" : string.Empty) +
                (profile.NNonNumeric > 0 ? $", {Numbers.Count(profile.NNonNumeric)} not numeric" : string.Empty) + ".";
        }

        if (profile.NUsed < thresholds.MinUsableRows)
        {
            return $"Only {Numbers.Count(profile.NUsed)} usable {(profile.NUsed == 1 ? "row" : "rows")} of {xName} and {yName} (of {Rows(rows)} in the window); " +
                $"measuring a relationship needs at least {Numbers.Count(thresholds.MinUsableRows)} (min_usable_rows).";
        }

        bool xConstant = profile.DistinctX == 1;
        bool yConstant = profile.DistinctY == 1;
        if (xConstant && yConstant)
        {
            return $"{xName} and {yName} are both constant ({Value(profile.XMean)} and {Value(profile.YMean)}) " +
                $"in all {Numbers.Count(profile.NUsed)} usable rows: correlation and slope are undefined.";
        }

        if (xConstant || yConstant)
        {
            var (name, value) = xConstant ? (xName, profile.XMean) : (yName, profile.YMean);
            return $"{name} is constant ({Value(value)}) in all {Numbers.Count(profile.NUsed)} usable rows: " +
                $"the correlation of {yName} with {xName} is undefined.";
        }

        return null;
    }

    private static string Rows(long n) => Numbers.Count(n) + (n == 1 ? " row" : " rows");

    private static string Value(double? v) => Numbers.Sig(v, 6);
}
