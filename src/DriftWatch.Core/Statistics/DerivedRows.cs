using System.Globalization;

namespace DriftWatch.Core.Statistics;

/// <summary>
/// The largest share of rows lying exactly on one straight line y = a + b·x: a column copied or derived from
/// the other on part of the rows (one source system of several, one job of two), which the whole-sample
/// exactness test cannot see because the other rows scatter.
/// </summary>
/// <remarks>
/// Rows derived by one formula are exactly collinear, so neighbours in x order that are both derived give the
/// same (slope, intercept) to the last bits, while independent rows almost never do. The candidate is the most
/// frequent line through neighbouring rows (rounded to 9 significant digits to absorb rounding); its share is
/// then counted exactly with the exactness tolerance. O(n log n) for the sort. Discrete columns (small integers)
/// put many rows on one line by coincidence; comparisons treat the share as a state of the pair and alert only on
/// a rise over the baseline runs'. Written here: MathNet.Numerics has no such test (robust line fits such as
/// RANSAC find a dominant line, not an exact one).
/// </remarks>
internal static class DerivedRows
{
    /// <summary>Fewer neighbouring pairs than this on the candidate line: no candidate.</summary>
    private const int MinVotes = 3;

    /// <returns>The share of rows on the most frequent exact line and the line, or null with fewer than 10 rows.</returns>
    public static (double Share, double Slope, double Intercept)? Of(double[] x, double[] y, double tolerance)
    {
        ArgumentNullException.ThrowIfNull(x);
        ArgumentNullException.ThrowIfNull(y);
        int n = x.Length;
        if (n < 10)
        {
            return null;
        }

        var order = new int[n];
        for (int i = 0; i < n; i++)
        {
            order[i] = i;
        }

        var keys = (double[])x.Clone();
        Array.Sort(keys, order);

        var votes = new Dictionary<(string Slope, string Intercept), (int Count, double Slope, double Intercept)>();
        for (int k = 1; k < n; k++)
        {
            int i = order[k - 1], j = order[k];
            double dx = x[j] - x[i];
            if (!(dx > 0))
            {
                continue;
            }

            double b = (y[j] - y[i]) / dx;
            double a = y[i] - (b * x[i]);

            // A level line is a repeated value of y (a cap, a default), not y derived from x.
            if (!double.IsFinite(a) || !double.IsFinite(b) || b == 0)
            {
                continue;
            }

            var key = (b.ToString("G9", CultureInfo.InvariantCulture), a.ToString("G9", CultureInfo.InvariantCulture));
            votes[key] = votes.TryGetValue(key, out var v) ? (v.Count + 1, v.Slope, v.Intercept) : (1, b, a);
        }

        if (votes.Count == 0)
        {
            return (0, 0, 0);
        }

        var best = votes.Values.MaxBy(v => v.Count);
        if (best.Count < MinVotes)
        {
            return (0, best.Slope, best.Intercept);
        }

        int on = 0;
        for (int i = 0; i < n; i++)
        {
            double scale = tolerance + (16 * double.Epsilon) + (16 * Math.ScaleB(1.0, -52) * (Math.Abs(y[i]) + Math.Abs(best.Slope * x[i])));
            if (Math.Abs(y[i] - (best.Intercept + (best.Slope * x[i]))) <= scale)
            {
                on++;
            }
        }

        return ((double)on / n, best.Slope, best.Intercept);
    }
}
