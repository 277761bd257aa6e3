using DriftWatch.Core.Discovery;

namespace DriftWatch.Core.Tests.Discovery;

/// <summary>
/// Computes a <see cref="SumPlan"/>'s aggregates the way the engines' SQL does (ordinary summation of the centred,
/// scaled finite values; null and non-finite rows left out), so the Core's arithmetic can be checked without a server.
/// </summary>
internal static class SumsInProcess
{
    public static List<ColumnStats> Stats(string[] names, double?[][] columns) =>
        [.. names.Select((name, k) =>
        {
            var finite = columns[k].Where(v => v is { } d && double.IsFinite(d)).Select(v => v!.Value).ToList();
            return new ColumnStats(name, columns[k].Length, finite.Count, columns[k].Count(v => v is null), finite.Count == 0 ? null : finite.Min(), finite.Count == 0 ? null : finite.Max());
        })];

    public static double[] Values(SumPlan plan, double?[][] columns)
    {
        var u = columns.Select((c, k) => c.Select(v => Deviation(v, plan.Columns[k])).ToArray()).ToArray();
        return [.. plan.Terms.Select(t => Term(t, u))];
    }

    private static double? Deviation(double? value, ColumnStats stats)
    {
        if (value is not { } v || !double.IsFinite(v))
        {
            return null;
        }

        var s = (Math.Abs(v) < stats.ValueFloor ? 0 : v * stats.Factor) - stats.ScaledCentre;
        return Math.Abs(s) < ColumnStats.DeviationFloor ? 0 : s;
    }

    private static double Term(SumTerm t, double?[][] u)
    {
        double sum = 0;
        for (var row = 0; row < u[0].Length; row++)
        {
            var a = u[t.I][row];
            var b = t.J >= 0 ? u[t.J][row] : 0;
            if (a is null || b is null)
            {
                continue;
            }

            sum += t.Kind switch
            {
                SumKind.Sum or SumKind.PairSum => a.Value,
                SumKind.SumSquares or SumKind.PairSumSquares => a.Value * a.Value,
                SumKind.Cross => a.Value * b.Value,
                _ => 1,
            };
        }

        return sum;
    }
}
