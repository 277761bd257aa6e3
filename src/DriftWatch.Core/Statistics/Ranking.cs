namespace DriftWatch.Core.Statistics;

/// <summary>
/// Ranks of one column from a single sort: mid-ranks (ties share the average rank, as Spearman's ρ
/// needs), dense ranks (0-based, for Kendall's τ-b and the monotone check), the sorting permutation,
/// the number of distinct values and the number of tied pairs. MathNet's RanksInplace gives only the
/// mid-ranks; we need all of these from the same sort, so this is written here.
/// </summary>
internal sealed class Ranking
{
    private Ranking(double[] midRanks, int[] dense, int[] order, int distinct, long tiedPairs)
    {
        MidRanks = midRanks;
        Dense = dense;
        Order = order;
        Distinct = distinct;
        TiedPairs = tiedPairs;
    }

    /// <summary>1-based average ranks, per row.</summary>
    public double[] MidRanks { get; }

    /// <summary>0-based index of the row's value among the distinct values, per row.</summary>
    public int[] Dense { get; }

    /// <summary>Row indices in ascending order of value.</summary>
    public int[] Order { get; }

    public int Distinct { get; }

    /// <summary>Σ t(t − 1)/2 over groups of t equal values.</summary>
    public long TiedPairs { get; }

    public static Ranking Of(double[] values)
    {
        ArgumentNullException.ThrowIfNull(values);
        int n = values.Length;
        var (keys, order) = RadixSort.Sort(values);
        var midRanks = GC.AllocateUninitializedArray<double>(n);
        var dense = GC.AllocateUninitializedArray<int>(n);
        int distinct = 0;
        long tiedPairs = 0;
        int start = 0;
        while (start < n)
        {
            int end = start + 1;
            ulong key = keys[start];
            while (end < n && keys[end] == key)
            {
                end++;
            }

            // Positions start..end-1 hold ranks start+1..end; their average:
            double mid = (start + end + 1) * 0.5;
            for (int k = start; k < end; k++)
            {
                int row = order[k];
                midRanks[row] = mid;
                dense[row] = distinct;
            }

            long t = end - start;
            tiedPairs += t * (t - 1) / 2;
            distinct++;
            start = end;
        }

        return new Ranking(midRanks, dense, order, distinct, tiedPairs);
    }
}
