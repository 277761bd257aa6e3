using System.Buffers;

namespace DriftWatch.Core.Statistics;

/// <summary>
/// Kendall's τ-b (Kendall 1945, ties in both columns) in O(n log n) by Knight's (1966) method:
/// sort by (x, y), count the swaps a merge sort of y needs (the discordant pairs), and correct for
/// ties. MathNet.Numerics has no Kendall correlation, hence this file.
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

        // y's dense ranks in x order; within a run of tied x, sorted by y so those pairs are no swaps.
        var sequence = GC.AllocateUninitializedArray<int>(n);
        for (int k = 0; k < n; k++)
        {
            sequence[k] = y.Dense[x.Order[k]];
        }

        long n3 = 0;
        int start = 0;
        while (start < n)
        {
            int xGroup = x.Dense[x.Order[start]];
            int end = start + 1;
            while (end < n && x.Dense[x.Order[end]] == xGroup)
            {
                end++;
            }

            if (end - start > 1)
            {
                Array.Sort(sequence, start, end - start);
                n3 += TiedPairsInSortedRun(sequence, start, end);
            }

            start = end;
        }

        long swaps = CountInversions(sequence);
        double numerator = (double)(n0 - n1 - n2 + n3) - (2.0 * swaps);
        double denominator = Math.Sqrt((double)(n0 - n1) * (n0 - n2));
        return Math.Clamp(numerator / denominator, -1.0, 1.0);
    }

    private static long TiedPairsInSortedRun(int[] values, int start, int end)
    {
        long pairs = 0;
        int i = start;
        while (i < end)
        {
            int j = i + 1;
            while (j < end && values[j] == values[i])
            {
                j++;
            }

            long t = j - i;
            pairs += t * (t - 1) / 2;
            i = j;
        }

        return pairs;
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
