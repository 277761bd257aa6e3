using DriftWatch.Core.Statistics;

namespace DriftWatch.Core.Profiling;

/// <summary>
/// Whether y's ranks follow x's exactly (|ρ| = 1, ties matching ties): checked on the dense ranks
/// directly, because Pearson's r of identical rank vectors can round to 0.9999999999999998.
/// </summary>
internal enum RankOrder
{
    Mixed,
    Same,
    Reversed,
}

internal static class RankOrders
{
    public static RankOrder Of(Ranking x, Ranking y)
    {
        if (x.Distinct != y.Distinct || x.Distinct < 2)
        {
            return RankOrder.Mixed;
        }

        int[] a = x.Dense, b = y.Dense;
        int top = y.Distinct - 1;
        bool same = true, reversed = true;
        for (int i = 0; i < a.Length && (same || reversed); i++)
        {
            same &= a[i] == b[i];
            reversed &= a[i] == top - b[i];
        }

        return same ? RankOrder.Same : reversed ? RankOrder.Reversed : RankOrder.Mixed;
    }
}
