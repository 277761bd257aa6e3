using System.Buffers;

namespace DriftWatch.Core.Statistics;

/// <summary>
/// Kendall's τ-b (Kendall 1945, ties in both columns) in O(n log n) by Knight's (1966) method:
/// order the rows by (x, y), count the swaps a merge sort of y needs (the discordant pairs), and
/// correct for ties. With few distinct y values a Fenwick tree does the same count faster. MathNet.Numerics has no Kendall correlation, hence this file.
/// </summary>
internal static class KendallTau
{
    /// <returns>τ-b, or null when either column has no untied pair (zero variance).</returns>
    public static double? TauB(Ranking x, Ranking y)
    {
        ArgumentNullException.ThrowIfNull(x);
        ArgumentNullException.ThrowIfNull(y);
        int n = x.Order.Length;
        long n0 = (long)n * (n - 1) / 2;
        long n1 = x.TiedPairs;
        long n2 = y.TiedPairs;
        if (n0 - n1 <= 0 || n0 - n2 <= 0)
        {
            return null;
        }

        // y's dense ranks ordered by (x, y): a stable counting sort by x's dense rank of the rows in y
        // order, O(n), so runs of tied x come out already sorted by y (those pairs are no swaps).
        var xStart = new int[x.Distinct + 1];
        foreach (int row in y.Order)
        {
            xStart[x.Dense[row] + 1]++;
        }

        for (int g = 1; g <= x.Distinct; g++)
        {
            xStart[g] += xStart[g - 1];
        }

        var sequence = GC.AllocateUninitializedArray<int>(n);
        var xOfSlot = GC.AllocateUninitializedArray<int>(n);
        foreach (int row in y.Order)
        {
            int slot = xStart[x.Dense[row]]++;
            sequence[slot] = y.Dense[row];
            xOfSlot[slot] = x.Dense[row];
        }

        long n3 = 0;
        int runStart = 0;
        for (int k = 1; k <= n; k++)
        {
            if (k == n || xOfSlot[k] != xOfSlot[runStart] || sequence[k] != sequence[runStart])
            {
                long t = k - runStart;
                n3 += t * (t - 1) / 2;
                runStart = k;
            }
        }

        long swaps = CountInversions(sequence, y.Distinct);
        double numerator = (double)(n0 - n1 - n2 + n3) - (2.0 * swaps);
        double denominator = Math.Sqrt((double)(n0 - n1) * (n0 - n2));
        return Math.Clamp(numerator / denominator, -1.0, 1.0);
    }

    /// <summary>Largest number of distinct values for which the Fenwick count is used (its tree fits in L2 cache).</summary>
    internal const int FenwickMaxDistinct = 1 << 16;

    /// <summary>
    /// Pairs i &lt; j with a[i] &gt; a[j] (strictly) of values in [0, distinct). With few distinct
    /// values (money and weights rounded to cents repeat a lot) a Fenwick tree over the values counts
    /// them three times faster than the merge sort, whose branches mispredict on near-random ranks;
    /// with many it misses cache and the merge sort wins. Both are O(n log n) and give the same count.
    /// </summary>
    internal static long CountInversions(int[] a, int distinct) =>
        distinct <= FenwickMaxDistinct ? CountInversionsFenwick(a, distinct) : CountInversions(a);

    /// <summary>The same count by a Fenwick (binary indexed) tree of the values seen to the right; leaves <paramref name="a"/> as is.</summary>
    internal static long CountInversionsFenwick(int[] a, int distinct)
    {
        var tree = new int[distinct + 1];
        long inversions = 0;
        for (int i = a.Length - 1; i >= 0; i--)
        {
            // Values strictly below a[i] already seen, i.e. to its right: tree prefix 1..a[i].
            int value = a[i];
            for (int k = value; k > 0; k -= k & -k)
            {
                inversions += tree[k];
            }

            for (int k = value + 1; k <= distinct; k += k & -k)
            {
                tree[k]++;
            }
        }

        return inversions;
    }

    /// <summary>Pairs i &lt; j with a[i] &gt; a[j] (strictly), by bottom-up merge sort; sorts <paramref name="a"/>.</summary>
    internal static long CountInversions(int[] a)
    {
        int n = a.Length;
        long inversions = 0;

        // Insertion sort of short blocks first: cheaper than merging runs of 1 and 2.
        const int Block = 16;
        for (int lo = 0; lo < n; lo += Block)
        {
            int hi = Math.Min(lo + Block, n);
            for (int i = lo + 1; i < hi; i++)
            {
                int v = a[i];
                int j = i - 1;
                while (j >= lo && a[j] > v)
                {
                    a[j + 1] = a[j];
                    j--;
                }

                a[j + 1] = v;
                inversions += i - 1 - j;
            }
        }

        var source = a;
        var buffer = ArrayPool<int>.Shared.Rent(n);
        var target = buffer;
        for (int width = Block; width < n; width *= 2)
        {
            for (int lo = 0; lo < n; lo += 2 * width)
            {
                int mid = Math.Min(lo + width, n);
                int hi = Math.Min(lo + (2 * width), n);
                int i = lo, j = mid, k = lo;
                while (i < mid && j < hi)
                {
                    if (source[i] <= source[j])
                    {
                        target[k++] = source[i++];
                    }
                    else
                    {
                        // source[j] jumps over every element still waiting in the left run.
                        inversions += mid - i;
                        target[k++] = source[j++];
                    }
                }

                while (i < mid)
                {
                    target[k++] = source[i++];
                }

                while (j < hi)
                {
                    target[k++] = source[j++];
                }
            }

            (source, target) = (target, source);
        }

        if (!ReferenceEquals(source, a))
        {
            Array.Copy(source, a, n);
        }

        ArrayPool<int>.Shared.Return(buffer);
        return inversions;
    }
}
