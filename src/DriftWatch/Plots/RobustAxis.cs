using MathNet.Numerics.Statistics;

namespace DriftWatch.Plots;

/// <summary>
/// Axis limits that keep the bulk of the data readable: the values inside Tukey's far-out fences, quartiles
/// ∓ 3·IQR (common practice for "far out" values), set the range; values beyond them (a 99999 placeholder, a
/// value in the wrong unit) are off-scale and drawn at the edge. When half the values are equal (IQR 0) the
/// 5th and 95th percentiles stand in for the quartiles. Values beyond a fence but within a quarter of the bulk's
/// span of it are kept on the scale: showing them costs the bulk little, so only far values go to the edge.
/// </summary>
internal static class RobustAxis
{
    public const double FenceIqrs = 3;

    /// <summary>Values this share of the fenced range beyond it still stay on the scale.</summary>
    public const double Reach = 0.25;

    /// <summary>Share of the range left free on each side of the data.</summary>
    public const double Padding = 0.05;

    /// <summary>The range of the values inside the fences (no padding); null for no finite values.</summary>
    public static AxisRange? Bulk(IEnumerable<double> values)
    {
        ArgumentNullException.ThrowIfNull(values);
        var sorted = values.Where(double.IsFinite).ToArray();
        if (sorted.Length == 0)
        {
            return null;
        }

        Array.Sort(sorted);
        double low = sorted[0], high = sorted[^1];
        var (q1, q3) = (SortedArrayStatistics.Quantile(sorted, 0.25), SortedArrayStatistics.Quantile(sorted, 0.75));
        if (!(q3 > q1))
        {
            (q1, q3) = (SortedArrayStatistics.Quantile(sorted, 0.05), SortedArrayStatistics.Quantile(sorted, 0.95));
        }

        if (!(q3 > q1))
        {
            // Nearly all values equal: the data's own range, however wide, is all there is to show.
            return new AxisRange(low, high);
        }

        double spread = q3 - q1, fenceLow = q1 - (FenceIqrs * spread), fenceHigh = q3 + (FenceIqrs * spread);
        double inLow = sorted.First(v => v >= fenceLow), inHigh = sorted.Last(v => v <= fenceHigh);
        double reach = (inHigh - inLow) * Reach;
        return new AxisRange(sorted.First(v => v >= inLow - reach), sorted.Last(v => v <= inHigh + reach));
    }

    /// <summary>A range widened by <see cref="Padding"/> on each side; a single value gets a range around it.</summary>
    public static AxisRange Pad(AxisRange range, double padding = Padding)
    {
        ArgumentNullException.ThrowIfNull(range);
        double span = range.Span;
        if (!(span > 0))
        {
            double half = Math.Max(Math.Abs(range.Min) * 0.1, 1);
            return new AxisRange(range.Min - half, range.Max + half);
        }

        return new AxisRange(range.Min - (span * padding), range.Max + (span * padding));
    }
}
