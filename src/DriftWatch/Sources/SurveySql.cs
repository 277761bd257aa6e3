using System.Globalization;
using DriftWatch.Core.Discovery;

namespace DriftWatch.Sources;

/// <summary>
/// The SQL a survey shares between kinds (standard aggregates with FILTER, which PostgreSQL and SQLite both take).
/// Column k is read as x{k}; s{k} is its scaled deviation from the centre, null unless finite
/// (<c>x·f − c·f</c>, f a power of two, so nothing overflows); u{k} is s{k} with deviations below
/// <see cref="ColumnStats.DeviationFloor"/> read as 0, so no product of two of them can underflow (PostgreSQL fails
/// a multiplication that underflows, SQLite does not).
/// </summary>
internal static class SurveySql
{
    /// <summary>A real literal (never an integer one: SQLite sums integers as integers, which can overflow).</summary>
    public static string Real(double value, string suffix = "")
    {
        var text = value.ToString("R", CultureInfo.InvariantCulture);
        if (!text.Contains('.', StringComparison.Ordinal) && !text.Contains('E', StringComparison.Ordinal))
        {
            text += ".0";
        }

        return text + suffix;
    }

    /// <summary>SELECT of u0…u{n−1} from the rows of <paramref name="readValues"/>, which selects x0…x{n−1}.</summary>
    /// <param name="finite">The test that x{k} is a finite number, given the column reference.</param>
    /// <param name="realSuffix">Appended to every literal (PostgreSQL: "::float8").</param>
    public static string Deviations(IReadOnlyList<ColumnStats> stats, string readValues, Func<string, string> finite, string realSuffix)
    {
        var s = stats.Select((c, k) =>
            $"CASE WHEN {finite($"x{k}")} THEN (CASE WHEN abs(x{k}) < {Real(c.ValueFloor, realSuffix)} THEN {Real(0, realSuffix)} ELSE x{k} * {Real(c.Factor, realSuffix)} END) - {Real(c.ScaledCentre, realSuffix)} END AS s{k}");
        var u = stats.Select((_, k) => $"CASE WHEN abs(s{k}) < {Real(ColumnStats.DeviationFloor, realSuffix)} THEN {Real(0, realSuffix)} ELSE s{k} END AS u{k}");
        return $"SELECT {string.Join(", ", u)} FROM (SELECT {string.Join(", ", s)} FROM ({readValues}) a) b";
    }

    /// <summary>One aggregate of the plan; a sum over no rows is 0.</summary>
    public static string Term(SumTerm term) => term.Kind switch
    {
        SumKind.Sum => $"coalesce(sum(u{term.I}), 0)",
        SumKind.SumSquares => $"coalesce(sum(u{term.I} * u{term.I}), 0)",
        SumKind.Cross => $"coalesce(sum(u{term.I} * u{term.J}), 0)",
        SumKind.PairCount => $"count(*) FILTER (WHERE u{term.I} IS NOT NULL AND u{term.J} IS NOT NULL)",
        SumKind.PairSum => $"coalesce(sum(u{term.I}) FILTER (WHERE u{term.J} IS NOT NULL), 0)",
        SumKind.PairSumSquares => $"coalesce(sum(u{term.I} * u{term.I}) FILTER (WHERE u{term.J} IS NOT NULL), 0)",
        _ => throw new ArgumentOutOfRangeException(nameof(term)),
    };

    /// <summary>The first pass for column k: total rows, non-null values, finite values, finite min and max.</summary>
    public static IEnumerable<string> StatsTerms(int k, Func<string, string> finite)
    {
        var column = $"x{k}";
        yield return "count(*)";
        yield return $"count({column})";
        yield return $"count(*) FILTER (WHERE {finite(column)})";
        yield return $"min({column}) FILTER (WHERE {finite(column)})";
        yield return $"max({column}) FILTER (WHERE {finite(column)})";
    }

    public const int StatsPerColumn = 5;

    /// <summary>The figures of the first pass, <see cref="StatsPerColumn"/> values per column.</summary>
    public static List<ColumnStats> ReadStats(IReadOnlyList<string> columns, IReadOnlyList<double?> values)
    {
        var stats = new List<ColumnStats>(columns.Count);
        for (var k = 0; k < columns.Count; k++)
        {
            var o = k * StatsPerColumn;
            var rows = (long)(values[o] ?? 0);
            stats.Add(new ColumnStats(columns[k], rows, (long)(values[o + 2] ?? 0), rows - (long)(values[o + 1] ?? 0), values[o + 3], values[o + 4]));
        }

        return stats;
    }
}
