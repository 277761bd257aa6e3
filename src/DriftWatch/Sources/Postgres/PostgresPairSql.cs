using NpgsqlTypes;

namespace DriftWatch.Sources.Postgres;

/// <summary>
/// The SQL of one pair's check. Values are cast to float8 only after the columns were checked to be
/// numeric, so a text column is reported, not coerced. A value is usable when both x and y are finite:
/// in PostgreSQL NaN sorts above +Infinity, so <c>v &gt; '-Infinity' AND v &lt; 'Infinity'</c> is exactly "finite".
/// </summary>
internal sealed class PostgresPairSql(PairTarget target, DateTimeOffset? windowFrom, DateTimeOffset? windowTo)
{
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

    /// <summary>Exact counts and linear figures over the whole window, in one scan.</summary>
    public (string Sql, PositionalParameters Parameters) Aggregate()
    {
        var p = new PositionalParameters();
        var sql = $"""
            SELECT count(*) AS row_count,
                   count(*) FILTER (WHERE d.x IS NULL OR d.y IS NULL) AS null_count,
                   count(*) FILTER (WHERE d.ok) AS used_count,
                   corr(d.y, d.x) FILTER (WHERE d.ok),
                   regr_slope(d.y, d.x) FILTER (WHERE d.ok),
                   regr_intercept(d.y, d.x) FILTER (WHERE d.ok),
                   avg(d.x) FILTER (WHERE d.ok),
                   avg(d.y) FILTER (WHERE d.ok),
                   var_samp(d.x) FILTER (WHERE d.ok),
                   var_samp(d.y) FILTER (WHERE d.ok)
            FROM (SELECT v.x, v.y,
                         (v.x > '-Infinity'::float8 AND v.x < 'Infinity'::float8 AND v.y > '-Infinity'::float8 AND v.y < 'Infinity'::float8) AS ok
                  FROM ({Values(p, null)}) v) d
            """;
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
                sql = Values(p, null) + " ORDER BY random() LIMIT " + p.Add(rows, NpgsqlDbType.Integer);
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

    private string Values(PositionalParameters p, string? tablesample) =>
        $"SELECT {Column(target.X)}::float8 AS x, {Column(target.Y)}::float8 AS y FROM {From()}{tablesample}{Where(p)}";

    private string From() => target.Table is { } table ? table.Quoted : $"({target.Query}) AS q";

    private string Column(string quoted) => target.IsTable ? quoted : "q." + quoted;

    private string Where(PositionalParameters p, bool withWindow = true)
    {
        var conditions = new List<string>();
        if (withWindow && target.WindowColumn is not null && windowFrom is { } from && windowTo is { } to)
        {
            var column = Column(target.WindowColumn);
            conditions.Add($"{column} >= {p.Add(from.UtcDateTime, NpgsqlDbType.TimestampTz)} AND {column} < {p.Add(to.UtcDateTime, NpgsqlDbType.TimestampTz)}");
        }

        if (target.Where is not null)
        {
            conditions.Add($"({target.Where})");
        }

        return conditions.Count == 0 ? string.Empty : " WHERE " + string.Join(" AND ", conditions);
    }
}
