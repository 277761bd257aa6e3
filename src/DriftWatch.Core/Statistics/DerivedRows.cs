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

        // The neighbouring lines, in x order: the order their keys first appear in, which breaks ties between candidates.
        var slopes = new double[n - 1];
        var intercepts = new double[n - 1];
        int m = 0;
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

            slopes[m] = b;
            intercepts[m] = a;
            m++;
        }

        if (m == 0)
        {
            return (0, 0, 0);
        }

        var best = MostFrequent(slopes, intercepts, m);
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

    /// <summary>
    /// The most frequent line of the first <paramref name="m"/> candidates, keyed by slope and intercept rounded to 9
    /// significant digits ("G9"); among equally frequent ones the one whose key appears first, with the figures of its
    /// first candidate.
    /// </summary>
    /// <remarks>
    /// Formatting two numbers per neighbouring pair of rows was most of a profile's time, and nearly every candidate
    /// has a key of its own. Two slopes with the same 9-digit text differ by at most 1e-8 of the larger; so a slope
    /// farther than that from both its neighbours in slope order shares its key with no other candidate and counts
    /// once, unformatted. Only the others are formatted and counted by their text, which gives exactly the counts and
    /// the winner of counting every candidate by its text.
    /// </remarks>
    private static (int Count, double Slope, double Intercept) MostFrequent(double[] slopes, double[] intercepts, int m)
    {
        // The radix sort of the ranks rather than Array.Sort (a comparison sort; see docs/performance.md). The
        // order among equal slopes differs between the two, which cannot change a mark: equal slopes mark each other.
        var (_, bySlope) = RadixSort.Sort(slopes[..m]);
        var shared = new bool[m];
        for (int s = 1; s < m; s++)
        {
            double high = slopes[bySlope[s]], low = slopes[bySlope[s - 1]];
            // 4e-8 rather than 1e-8: a margin for the rounding of this test itself; a candidate marked in excess is only formatted.
            if (high - low <= 4e-8 * Math.Max(Math.Abs(high), Math.Abs(low)))
            {
                shared[bySlope[s]] = true;
                shared[bySlope[s - 1]] = true;
            }
        }

        // Count, first candidate, figures of that candidate.
        var votes = new Dictionary<(string Slope, string Intercept), (int Count, int First, double Slope, double Intercept)>();
        (int Count, int First, double Slope, double Intercept) best = (0, int.MaxValue, 0, 0);
        for (int c = 0; c < m; c++)
        {
            (int Count, int First, double Slope, double Intercept) entry;
            if (!shared[c])
            {
                entry = (1, c, slopes[c], intercepts[c]);
            }
            else
            {
                var key = (slopes[c].ToString("G9", CultureInfo.InvariantCulture), intercepts[c].ToString("G9", CultureInfo.InvariantCulture));
                entry = votes.TryGetValue(key, out var v) ? (v.Count + 1, v.First, v.Slope, v.Intercept) : (1, c, slopes[c], intercepts[c]);
                votes[key] = entry;
            }

            if (entry.Count > best.Count || (entry.Count == best.Count && entry.First < best.First))
            {
                best = entry;
            }
        }

        return (best.Count, best.Slope, best.Intercept);
    }
}
