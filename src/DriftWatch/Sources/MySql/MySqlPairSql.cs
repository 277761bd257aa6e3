using System.Globalization;

namespace DriftWatch.Sources.MySql;

/// <summary>
/// The SQL of one MySQL/MariaDB pair's check. MySQL's DOUBLE holds no NaN or Infinity, so a row is usable when
/// both values are not null. MariaDB has no corr or regr_slope: the figures come from one two-pass statement
/// (means first, then centred sums of squares and products), which keeps the precision raw sums lose.
/// Names arrive backtick-quoted (<see cref="SqlIdentifier.Backtick"/>).
/// </summary>
internal sealed class MySqlPairSql(PairTarget target, WindowRange? window)
{
    public string Probe()
    {
        var window = target.WindowColumn is null ? string.Empty : ", " + Column(target.WindowColumn);
        var filter = target.Where is null ? string.Empty : $" WHERE ({target.Where})";
        return $"SELECT {Column(target.X)}, {Column(target.Y)}{window} FROM {From()}{filter} LIMIT 0";
    }

    /// <summary>The newest value of the window column at or before <paramref name="at"/> within the filter, as DATETIME(6) in the session's UTC; NULL when none.</summary>
    public (string Sql, NamedParameters Parameters) Latest(DateTimeOffset at)
    {
        var p = new NamedParameters('@');
        var column = Column(target.WindowColumn!);
        var filter = target.Where is null ? string.Empty : $" AND ({target.Where})";
        return ($"SELECT CAST(max({column}) AS DATETIME(6)) FROM {From()} WHERE {column} <= {p.Add(at.UtcDateTime)}{filter}", p);
    }

    /// <summary>Row counts, means and centred sums; with <paramref name="rescaling"/> on x·2^k − s (see <see cref="Rescaling"/>).</summary>
    public (string Sql, NamedParameters Parameters) Aggregate(Rescaling? rescaling = null)
    {
        var p = new NamedParameters('@');
        string Source()
        {
            if (rescaling is null)
            {
                return Values(p);
            }

            var x = $"({Scaled("v.x", rescaling.XFactor, rescaling.XFloor, p)} - {p.Add(rescaling.XShift)})";
            var y = $"({Scaled("v.y", rescaling.YFactor, rescaling.YFloor, p)} - {p.Add(rescaling.YShift)})";
            return $"SELECT {x} AS x, {y} AS y FROM ({Values(p)}) v";
        }

        var means = $"SELECT AVG(CASE WHEN u.x IS NOT NULL AND u.y IS NOT NULL THEN u.x END) AS mx, AVG(CASE WHEN u.x IS NOT NULL AND u.y IS NOT NULL THEN u.y END) AS my FROM ({Source()}) u";
        var sql = $"""
            SELECT COUNT(*),
                   COALESCE(SUM(d.x IS NULL OR d.y IS NULL), 0),
                   COALESCE(SUM(d.x IS NOT NULL AND d.y IS NOT NULL), 0),
                   MAX(m.mx), MAX(m.my),
                   SUM(CASE WHEN d.y IS NOT NULL THEN (d.x - m.mx) * (d.x - m.mx) END),
                   SUM(CASE WHEN d.x IS NOT NULL THEN (d.y - m.my) * (d.y - m.my) END),
                   SUM((d.x - m.mx) * (d.y - m.my))
            FROM ({Source()}) d CROSS JOIN ({means}) m
            """;
        return (sql, p);
    }

    public (string Sql, NamedParameters Parameters) Range()
    {
        var p = new NamedParameters('@');
        return ($"SELECT MIN(d.x), MAX(d.x), MIN(d.y), MAX(d.y) FROM ({Values(p)}) d WHERE d.x IS NOT NULL AND d.y IS NOT NULL", p);
    }

    public (string Sql, NamedParameters Parameters) Farthest(LineDistance line, int count)
    {
        ArgumentNullException.ThrowIfNull(line);
        var p = new NamedParameters('@');
        var y = Scaled("d.y", line.Factor, line.YFloor, p);
        var x = Scaled("d.x", line.ScaledSlope, line.XFloor, p);
        var sql = $"SELECT d.x, d.y FROM ({Values(p)}) d WHERE d.x IS NOT NULL AND d.y IS NOT NULL ORDER BY ABS({y} - {p.Add(line.ScaledIntercept)} - {x}) DESC LIMIT {Int(count)}";
        return (sql, p);
    }

    /// <summary>
    /// <c>random</c>: each window row is kept with probability q = (n + 5√n + 5) / N, N the exact window rows,
    /// and only the ~n kept rows are put in random order to cut them to n: one scan, no sort of the window.
    /// The kept count is binomial with mean n + 5√n + 5, so fewer than n rows come back with a probability
    /// below 1e-6 (five standard deviations).
    /// </summary>
    public (string Sql, NamedParameters Parameters) Sample(SamplePlan plan, int rows, long windowRows, int? seed)
    {
        var p = new NamedParameters('@');
        if (plan.Draw == SampleDraw.All)
        {
            return (Values(p), p);
        }

        var keep = KeepProbability(rows, windowRows);
        var (filterRand, orderRand) = seed is { } s ? ($"RAND({Int(s)})", $"RAND({Int(s)} + 1)") : ("RAND()", "RAND()");
        var sql = $"SELECT s.x, s.y FROM (SELECT v.x, v.y FROM ({Values(p)}) v WHERE {filterRand} < {p.Add(keep)}) s ORDER BY {orderRand} LIMIT {Int(rows)}";
        return (sql, p);
    }

    public static double KeepProbability(int rows, long windowRows) =>
        windowRows <= 0 ? 1.0 : Math.Min(1.0, (rows + (5 * Math.Sqrt(rows)) + 5) / windowRows);

    private string Values(NamedParameters p) =>
        $"SELECT CAST({Column(target.X)} AS DOUBLE) AS x, CAST({Column(target.Y)} AS DOUBLE) AS y FROM {From()}{Where(p)}";

    private static string Scaled(string value, double factor, double floor, NamedParameters p) =>
        $"(CASE WHEN ABS({value}) < {p.Add(floor)} THEN 0e0 ELSE {value} * {p.Add(factor)} END)";

    private static string Int(int value) => value.ToString(CultureInfo.InvariantCulture);

    private string From() => target.Table is { } table ? table.Backticked : $"({target.Query}) AS q";

    private string Column(string quoted) => target.IsTable ? quoted : "q." + quoted;

    private string Where(NamedParameters p)
    {
        var conditions = new List<string>();
        if (target.WindowColumn is not null && window is not null)
        {
            var column = Column(target.WindowColumn);
            var (lower, upper) = window.Operators;
            conditions.Add($"{column} {lower} {p.Add(window.From.UtcDateTime)} AND {column} {upper} {p.Add(window.To.UtcDateTime)}");
        }

        if (target.Where is not null)
        {
            conditions.Add($"({target.Where})");
        }

        return conditions.Count == 0 ? string.Empty : " WHERE " + string.Join(" AND ", conditions);
    }
}
