using NpgsqlTypes;

namespace DriftWatch.Sources.Postgres;

/// <summary>
/// The SQL of one pair's check. Values are cast to float8 only after the columns were checked to be
/// numeric, so a text column is reported, not coerced. A value is usable when both x and y are finite:
/// in PostgreSQL NaN sorts above +Infinity, so <c>v &gt; '-Infinity' AND v &lt; 'Infinity'</c> is exactly "finite".
/// A <c>numeric</c> value beyond float8's range (|v| above 1.8e308) would fail the whole cast; it is read as
/// ±Infinity instead, so it is counted with the non-finite values, and one below float8's smallest
/// subnormal is read as 0 (its own rounding). Set <paramref name="numericX"/>/<paramref name="numericY"/>
/// from the column types (<see cref="Probe"/>), since the guard costs a numeric comparison per value.
/// </summary>
internal sealed class PostgresPairSql(PairTarget target, WindowRange? window, bool numericX = false, bool numericY = false)
{
    // Above float8's largest value (1.7976931348623157e308) but below the point where the cast rounds to
    // infinity and fails; below the smallest subnormal (4.9e-324) the cast fails on underflow.
    private const string Float8Max = "1.7976931348623158e308";
    private const string Float8Tiny = "2.5e-324";

    /// <summary>
    /// Zero rows, but the server resolves the relation, the columns and the filter, and reports their types.
    /// Without the window condition, which would fail on a window column of the wrong type before we can name it.
    /// </summary>
    public (string Sql, PositionalParameters Parameters) Probe()
    {
        var p = new PositionalParameters();
        var window = target.WindowColumn is null ? string.Empty : ", " + Column(target.WindowColumn);
        return ($"SELECT {Column(target.X)}, {Column(target.Y)}{window} FROM {From()}{Where(p, withWindow: false)} LIMIT 0", p);
    }

    /// <summary>
    /// The newest value of the window column at or before <paramref name="at"/> within the pair's filter, as
    /// timestamptz (the session is in UTC, so a timestamp without time zone or a date is read as UTC); NULL when none.
    /// </summary>
    public (string Sql, PositionalParameters Parameters) Latest(DateTimeOffset at)
    {
        var p = new PositionalParameters();
        var column = Column(target.WindowColumn!);
        var filter = target.Where is null ? string.Empty : $" AND ({target.Where})";
        return ($"SELECT max({column})::timestamptz FROM {From()} WHERE {column} <= {p.Add(at.UtcDateTime, NpgsqlDbType.TimestampTz)}{filter}", p);
    }

    /// <summary>
    /// Exact counts and linear figures over the whole window, in one scan. With <paramref name="rescaling"/> the
    /// aggregates run on x·2^XExponent − XShift and the like for y (see <see cref="Rescaling"/>), for values
    /// float8's aggregates cannot take as they are.
    /// </summary>
    public (string Sql, PositionalParameters Parameters) Aggregate(Rescaling? rescaling = null)
    {
        var p = new PositionalParameters();
        var (x, y) = rescaling is null
            ? ("d.x", "d.y")
            : ($"({Scaled("d.x", rescaling.XFactor, rescaling.XFloor, p)} - {p.Add(rescaling.XShift, NpgsqlDbType.Double)})",
               $"({Scaled("d.y", rescaling.YFactor, rescaling.YFloor, p)} - {p.Add(rescaling.YShift, NpgsqlDbType.Double)})");
        var sql = $"""
            SELECT count(*) AS row_count,
                   count(*) FILTER (WHERE d.x IS NULL OR d.y IS NULL) AS null_count,
                   count(*) FILTER (WHERE d.ok) AS used_count,
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

    /// <summary>The smallest and largest x and y over the usable rows of the window: what <see cref="Rescaling"/> needs.</summary>
    public (string Sql, PositionalParameters Parameters) Range()
    {
        var p = new PositionalParameters();
        return ($"SELECT min(d.x) FILTER (WHERE d.ok), max(d.x) FILTER (WHERE d.ok), min(d.y) FILTER (WHERE d.ok), max(d.y) FILTER (WHERE d.ok) FROM {Usable(p)} d", p);
    }

    /// <summary>
    /// The <paramref name="count"/> usable rows of the window farthest from y = a + b·x, farthest first, in one
    /// scan; the distance is computed so that it cannot overflow (see <see cref="LineDistance"/>).
    /// </summary>
    public (string Sql, PositionalParameters Parameters) Farthest(LineDistance line, int count)
    {
        ArgumentNullException.ThrowIfNull(line);
        var p = new PositionalParameters();
        var y = Scaled("d.y", line.Factor, line.YFloor, p);
        var x = Scaled("d.x", line.ScaledSlope, line.XFloor, p);
        var distance = $"abs({y} - {p.Add(line.ScaledIntercept, NpgsqlDbType.Double)} - {x})";
        var sql = $"SELECT d.x, d.y FROM {Usable(p)} d WHERE d.ok ORDER BY {distance} DESC LIMIT {p.Add(count, NpgsqlDbType.Integer)}";
        return (sql, p);
    }

    public (string Sql, PositionalParameters Parameters) Sample(SamplePlan plan, int rows, int? seed, bool bernoulli)
    {
        var p = new PositionalParameters();
        string sql;
        switch (plan.Draw)
        {
            case SampleDraw.All:
                sql = Values(p, null);
                break;
            case SampleDraw.Random:
                sql = RandomDraw(Values(p, null), plan.Keep, rows, p);
                break;
            default:
                var method = bernoulli ? "BERNOULLI" : "SYSTEM";
                var tablesample = $" TABLESAMPLE {method} ({p.Add((float)plan.Percent!.Value, NpgsqlDbType.Real)})";
                if (seed is { } s)
                {
                    tablesample += $" REPEATABLE ({p.Add((double)s, NpgsqlDbType.Double)})";
                }

                // The random order spreads the LIMIT over all sampled blocks instead of keeping the first ones.
                sql = Values(p, tablesample) + " ORDER BY random() LIMIT " + p.Add(rows, NpgsqlDbType.Integer);
                break;
        }

        return (sql, p);
    }

    /// <summary>The window's values as float8, each row marked usable (<c>ok</c>) when both are finite.</summary>
    private string Usable(PositionalParameters p) => $"""
        (SELECT v.x, v.y,
                (v.x > '-Infinity'::float8 AND v.x < 'Infinity'::float8 AND v.y > '-Infinity'::float8 AND v.y < 'Infinity'::float8) AS ok
         FROM ({Values(p, null)}) v)
        """;

    private string Values(PositionalParameters p, string? tablesample) =>
        $"SELECT {Float8(Column(target.X), numericX)} AS x, {Float8(Column(target.Y), numericY)} AS y FROM {From()}{tablesample}{Where(p)}";

    /// <summary>
    /// <paramref name="rows"/> rows of <paramref name="values"/> in random order; with <paramref name="keep"/>, a random
    /// pre-filter first (<see cref="SamplePlanner.KeepFor"/>). Both call random(), so a seed set before repeats the draw.
    /// </summary>
    internal static string RandomDraw(string values, double? keep, int rows, PositionalParameters p) => keep is { } k
        ? $"SELECT * FROM ({values}) kept WHERE random() < {p.Add(k, NpgsqlDbType.Double)} ORDER BY random() LIMIT {p.Add(rows, NpgsqlDbType.Integer)}"
        : $"{values} ORDER BY random() LIMIT {p.Add(rows, NpgsqlDbType.Integer)}";

    internal static string Float8(string column, bool numeric) => numeric
        ? $"""
          CASE WHEN {column} IS NULL THEN NULL
               WHEN {column} = 'NaN'::numeric THEN 'NaN'::float8
               WHEN {column} > {Float8Max} THEN 'Infinity'::float8
               WHEN {column} < -{Float8Max} THEN '-Infinity'::float8
               WHEN abs({column}) < {Float8Tiny} THEN 0::float8
               ELSE {column}::float8 END
          """
        : column + "::float8";

    /// <summary>v·factor, with |v| below <paramref name="floor"/> read as 0 (PostgreSQL fails a multiplication that underflows).</summary>
    private static string Scaled(string value, double factor, double floor, PositionalParameters p) =>
        $"(CASE WHEN abs({value}) < {p.Add(floor, NpgsqlDbType.Double)} THEN 0::float8 ELSE {value} * {p.Add(factor, NpgsqlDbType.Double)} END)";

    internal string From() => target.Table is { } table ? table.Quoted : $"({target.Query}) AS q";

    internal string Column(string quoted) => target.IsTable ? quoted : "q." + quoted;

    internal string Where(PositionalParameters p, bool withWindow = true)
    {
        var conditions = new List<string>();
        if (withWindow && target.WindowColumn is not null && window is not null)
        {
            var column = Column(target.WindowColumn);
            var (lower, upper) = window.Operators;
            conditions.Add($"{column} {lower} {p.Add(window.From.UtcDateTime, NpgsqlDbType.TimestampTz)} AND {column} {upper} {p.Add(window.To.UtcDateTime, NpgsqlDbType.TimestampTz)}");
        }

        if (target.Where is not null)
        {
            conditions.Add($"({target.Where})");
        }

        return conditions.Count == 0 ? string.Empty : " WHERE " + string.Join(" AND ", conditions);
    }
}
