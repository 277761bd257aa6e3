using System.Globalization;

namespace DriftWatch.Sources.DuckDb;

/// <summary>
/// The SQL of one DuckDB pair's check. Values are cast to DOUBLE only after the columns were checked to be
/// numeric; a row is usable when both values are finite (<c>isfinite</c> is false for NaN and ±Infinity and
/// null for NULL). <paramref name="from"/> is the FROM item: a quoted table, a file scan or a query.
/// </summary>
internal sealed class DuckDbPairSql(PairTarget target, string from, WindowRange? window)
{
    /// <summary>The columns (and the window column), filtered, without rows: resolves names and the filter. Parse-checked as one SELECT.</summary>
    public string Probe()
    {
        var window = target.WindowColumn is null ? string.Empty : ", " + target.WindowColumn;
        var filter = target.Where is null ? string.Empty : $" WHERE ({target.Where})";
        return $"SELECT {target.X}, {target.Y}{window} FROM {from}{filter} LIMIT 0";
    }

    /// <summary>The newest value of the window column at or before <paramref name="at"/> within the filter, as a UTC TIMESTAMP (the session is in UTC); NULL when none.</summary>
    public (string Sql, NamedParameters Parameters) Latest(DateTimeOffset at)
    {
        var p = new NamedParameters('$');
        var filter = target.Where is null ? string.Empty : $" AND ({target.Where})";
        return ($"SELECT CAST(max({target.WindowColumn}) AS TIMESTAMP) FROM {from} WHERE {target.WindowColumn} <= {p.Add(at.UtcDateTime)}{filter}", p);
    }

    /// <summary>Exact counts and linear figures over the whole window in one scan, with DuckDB's own aggregates.</summary>
    public (string Sql, NamedParameters Parameters) Aggregate(Rescaling? rescaling = null)
    {
        var p = new NamedParameters('$');
        var (x, y) = rescaling is null
            ? ("d.x", "d.y")
            : ($"({Scaled("d.x", rescaling.XFactor, rescaling.XFloor, p)} - {p.Add(rescaling.XShift)})",
               $"({Scaled("d.y", rescaling.YFactor, rescaling.YFloor, p)} - {p.Add(rescaling.YShift)})");
        var sql = $"""
            SELECT count(*),
                   count(*) FILTER (WHERE d.x IS NULL OR d.y IS NULL),
                   count(*) FILTER (WHERE d.ok),
                   corr({y}, {x}) FILTER (WHERE d.ok),
                   regr_slope({y}, {x}) FILTER (WHERE d.ok),
                   regr_intercept({y}, {x}) FILTER (WHERE d.ok),
                   avg({x}) FILTER (WHERE d.ok),
                   avg({y}) FILTER (WHERE d.ok),
                   var_samp({x}) FILTER (WHERE d.ok),
                   var_samp({y}) FILTER (WHERE d.ok)
            FROM {Usable(p)} d
            """;
        return (sql, p);
    }

    public (string Sql, NamedParameters Parameters) Range()
    {
        var p = new NamedParameters('$');
        return ($"SELECT min(d.x) FILTER (WHERE d.ok), max(d.x) FILTER (WHERE d.ok), min(d.y) FILTER (WHERE d.ok), max(d.y) FILTER (WHERE d.ok) FROM {Usable(p)} d", p);
    }

    public (string Sql, NamedParameters Parameters) Farthest(LineDistance line, int count)
    {
        ArgumentNullException.ThrowIfNull(line);
        var p = new NamedParameters('$');
        var y = Scaled("d.y", line.Factor, line.YFloor, p);
        var x = Scaled("d.x", line.ScaledSlope, line.XFloor, p);
        var sql = $"SELECT d.x, d.y FROM {Usable(p)} d WHERE d.ok ORDER BY abs({y} - {p.Add(line.ScaledIntercept)} - {x}) DESC LIMIT {Int(count)}";
        return (sql, p);
    }

    /// <summary>
    /// The sample. <c>random</c> is a reservoir of exactly <paramref name="rows"/> rows over the window, drawn
    /// in one pass without sorting; <c>tablesample</c> first keeps p % of the table (system: whole vectors of
    /// 2 048 rows; bernoulli: row by row), then applies the window and a reservoir to cut the surplus.
    /// Sizes, percentages and seeds are numbers we format, never configured text.
    /// </summary>
    public (string Sql, NamedParameters Parameters) Sample(SamplePlan plan, int rows, int? seed, bool bernoulli)
    {
        var p = new NamedParameters('$');
        var repeatable = seed is { } s ? $" REPEATABLE ({Int(s)})" : string.Empty;
        var reservoir = $" USING SAMPLE reservoir({Int(rows)} ROWS){repeatable}";
        switch (plan.Draw)
        {
            case SampleDraw.All:
                return (Values(p, null), p);
            case SampleDraw.Random:
                return ($"SELECT s.x, s.y FROM ({Values(p, null)}) s{reservoir}", p);
            default:
                var method = bernoulli ? "bernoulli" : "system";
                var percent = plan.Percent!.Value.ToString("0.######", CultureInfo.InvariantCulture);
                var tablesample = seed is { } t ? $" TABLESAMPLE {percent}% ({method}, {Int(t)})" : $" TABLESAMPLE {percent}% ({method})";
                return ($"SELECT s.x, s.y FROM ({Values(p, tablesample)}) s{reservoir}", p);
        }
    }

    private string Usable(NamedParameters p) =>
        $"(SELECT v.x, v.y, coalesce(isfinite(v.x) AND isfinite(v.y), false) AS ok FROM ({Values(p, null)}) v)";

    private string Values(NamedParameters p, string? tablesample) =>
        $"SELECT CAST({target.X} AS DOUBLE) AS x, CAST({target.Y} AS DOUBLE) AS y FROM {from}{tablesample}{Where(p)}";

    private static string Scaled(string value, double factor, double floor, NamedParameters p) =>
        $"(CASE WHEN abs({value}) < {p.Add(floor)} THEN CAST(0 AS DOUBLE) ELSE {value} * {p.Add(factor)} END)";

    private static string Int(int value) => value.ToString(CultureInfo.InvariantCulture);

    private string Where(NamedParameters p)
    {
        var conditions = new List<string>();
        if (target.WindowColumn is not null && window is not null)
        {
            var (lower, upper) = window.Operators;
            conditions.Add($"{target.WindowColumn} {lower} {p.Add(window.From.UtcDateTime)} AND {target.WindowColumn} {upper} {p.Add(window.To.UtcDateTime)}");
        }

        if (target.Where is not null)
        {
            conditions.Add($"({target.Where})");
        }

        return conditions.Count == 0 ? string.Empty : " WHERE " + string.Join(" AND ", conditions);
    }
}
