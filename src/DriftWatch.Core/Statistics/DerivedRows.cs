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
    /// Formatting two numbers per neighbouring pair of rows was most of a profile's time, and on values rounded to
    /// cents many neighbouring pairs share a slope by coincidence. Keys are therefore found without formatting every
    /// candidate: rounding to 9 digits keeps order, so candidates with one slope text are a run of the slope order;
    /// equal numbers (bit for bit) share their text, and two different numbers can share it only when they lie within
    /// 4·10⁻⁸ of each other (same text: at most 10⁻⁸ of the larger apart), so only such neighbours are formatted and
    /// compared. Within each run of one slope text the intercepts are ordered and split the same way. The classes are
    /// exactly the keys that formatting every candidate would give (<c>DerivedRowsTests</c> checks it against that
    /// plain definition), so the counts, the winner and its tie-break are unchanged.
    /// </remarks>
    private static (int Count, double Slope, double Intercept) MostFrequent(double[] slopes, double[] intercepts, int m)
    {
        var (_, bySlope) = RadixSort.Sort(slopes[..m]);
        var key = new int[m];
        var keys = 0;
        var members = new List<int>();
        for (int start = 0; start < m;)
        {
            // One run of equal slope text: [start, end) of the slope order.
            int end = start + 1;
            string? lastText = null;
            while (end < m && SameText(slopes[bySlope[end - 1]], slopes[bySlope[end]], ref lastText))
            {
                end++;
            }

            if (end - start == 1)
            {
                key[bySlope[start]] = keys++;
            }
            else
            {
                members.Clear();
                for (int s = start; s < end; s++)
                {
                    members.Add(bySlope[s]);
                }

                // Zeros by sign, so a −0 intercept ("-0") and a +0 one ("0") are neighbours but not equal.
                members.Sort((a, b) => intercepts[a] != intercepts[b] ? intercepts[a].CompareTo(intercepts[b]) : double.IsNegative(intercepts[b]).CompareTo(double.IsNegative(intercepts[a])));
                string? lastIntercept = null;
                key[members[0]] = keys++;
                for (int i = 1; i < members.Count; i++)
                {
                    key[members[i]] = SameText(intercepts[members[i - 1]], intercepts[members[i]], ref lastIntercept) ? keys - 1 : keys++;
                }
            }

            start = end;
        }

        // Count, first candidate; the best by count, then by the earlier first candidate.
        var count = new int[keys];
        var first = new int[keys];
        Array.Fill(first, int.MaxValue);
        for (int c = 0; c < m; c++)
        {
            count[key[c]]++;
            first[key[c]] = Math.Min(first[key[c]], c);
        }

        int best = 0;
        for (int k = 1; k < keys; k++)
        {
            if (count[k] > count[best] || (count[k] == count[best] && first[k] < first[best]))
            {
                best = k;
            }
        }

        return (count[best], slopes[first[best]], intercepts[first[best]]);
    }

    /// <summary>
    /// Whether <paramref name="a"/> and <paramref name="b"/> (neighbours in order) have the same "G9" text;
    /// <paramref name="bText"/> carries b's text to the next call when it was formatted, so each number is formatted
    /// at most once per run.
    /// </summary>
    private static bool SameText(double a, double b, ref string? bText)
    {
        if (BitConverter.DoubleToInt64Bits(a) == BitConverter.DoubleToInt64Bits(b))
        {
            // Same number, same text; a text known for a still stands for b.
            return true;
        }

        // 4e-8 rather than 1e-8: a margin for the rounding of this test itself; a pair tested in excess is only formatted.
        if (!(Math.Abs(b - a) <= 4e-8 * Math.Max(Math.Abs(a), Math.Abs(b))))
        {
            bText = null;
            return false;
        }

        var aText = bText ?? a.ToString("G9", CultureInfo.InvariantCulture);
        bText = b.ToString("G9", CultureInfo.InvariantCulture);
        return string.Equals(aText, bText, StringComparison.Ordinal);
    }
}
