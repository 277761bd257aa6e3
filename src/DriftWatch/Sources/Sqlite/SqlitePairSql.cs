namespace DriftWatch.Sources.Sqlite;

/// <summary>
/// The SQL of one SQLite pair's check. Parameters: @from, @to (window: [@from, @to), or (@from, @to] with
/// <paramref name="endInclusive"/>), @rows.
/// Usable means both values are stored as numbers and finite (SQLite stores NaN as NULL but keeps ±Inf,
/// which it writes as 9e999; text always compares greater than numbers, so the range test also drops text).
/// </summary>
internal sealed class SqlitePairSql(PairTarget target, bool windowed, bool endInclusive = false)
{
    private const string Usable =
        "(typeof(x) IN ('integer', 'real') AND typeof(y) IN ('integer', 'real') AND x > -9e999 AND x < 9e999 AND y > -9e999 AND y < 9e999)";

    public string Probe()
    {
        var window = target.WindowColumn is null ? string.Empty : ", " + Column(target.WindowColumn);
        var filter = target.Where is null ? string.Empty : $" WHERE ({target.Where})";
        return $"SELECT {Column(target.X)}, {Column(target.Y)}{window} FROM {From()}{filter} LIMIT 0";
    }

    /// <summary>The window column's storage class and first value (without the window, which needs them).</summary>
    public string WindowProbe()
    {
        var column = Column(target.WindowColumn!);
        var filter = target.Where is null ? string.Empty : $" AND ({target.Where})";
        return $"SELECT typeof({column}), CAST({column} AS TEXT) FROM {From()} WHERE {column} IS NOT NULL{filter} LIMIT 1";
    }

    /// <summary>The newest value of the window column at or before @at (in the column's own form) within the filter; NULL when none.</summary>
    public string Latest()
    {
        var column = Column(target.WindowColumn!);
        var filter = target.Where is null ? string.Empty : $" AND ({target.Where})";
        return $"SELECT max({column}) FROM {From()} WHERE {column} IS NOT NULL AND {column} <= @at{filter}";
    }

    /// <summary>
    /// Counts, means and centred sums of squares and products in one statement: two passes over the window
    /// (means first, then centred sums), the textbook remedy for the cancellation of raw sums of squares.
    /// With <paramref name="rescaled"/> the values are x·@fx − @sx and y·@fy − @sy (see <see cref="Rescaling"/>):
    /// SQLite does not fail on overflow, its sums of squares of values near 1e300 just become infinite.
    /// </summary>
    public string Aggregate(bool rescaled = false) => $"""
        WITH d AS ({(rescaled ? $"SELECT x * @fx - @sx AS x, y * @fy - @sy AS y, ok, missing FROM ({Marked()})" : Marked())}),
             m AS (SELECT count(*) AS n_rows, coalesce(sum(missing), 0) AS n_null, coalesce(sum(ok), 0) AS n_used,
                          avg(CASE WHEN ok THEN x END) AS mx, avg(CASE WHEN ok THEN y END) AS my FROM d)
        SELECT m.n_rows, m.n_null, m.n_used, m.mx, m.my,
               sum((d.x - m.mx) * (d.x - m.mx)), sum((d.y - m.my) * (d.y - m.my)), sum((d.x - m.mx) * (d.y - m.my))
        FROM m LEFT JOIN d ON d.ok
        """;

    /// <summary>The smallest and largest x and y over the usable rows, as reals.</summary>
    public string Range() => $"SELECT min(x * 1.0), max(x * 1.0), min(y * 1.0), max(y * 1.0) FROM ({Values()}) WHERE {Usable}";

    /// <summary>
    /// The @count usable rows farthest from the line, farthest first, in one scan; the distance is
    /// |y·@f − @a − @b·x| with the factors of <see cref="LineDistance"/> (@yfloor, @xfloor as there).
    /// </summary>
    public string Farthest() => $"""
        SELECT x, y FROM ({Values()}) WHERE {Usable}
        ORDER BY abs((CASE WHEN abs(y * 1.0) < @yfloor THEN 0.0 ELSE y * @f END) - @a - (CASE WHEN abs(x * 1.0) < @xfloor THEN 0.0 ELSE @b * x END)) DESC
        LIMIT @count
        """;

    public string All() => Values();

    public string Random() => Values() + " ORDER BY random() LIMIT @rows";

    private string Marked() => $"SELECT x, y, {Usable} AS ok, (x IS NULL OR y IS NULL) AS missing FROM ({Values()})";

    private string Values() => $"SELECT {Column(target.X)} AS x, {Column(target.Y)} AS y FROM {From()}{Where()}";

    private string From() => target.Table is { } table ? table.Quoted : $"({target.Query}) AS q";

    private string Column(string quoted) => target.IsTable ? quoted : "q." + quoted;

    private string Where()
    {
        var conditions = new List<string>();
        if (windowed && target.WindowColumn is not null)
        {
            var column = Column(target.WindowColumn);
            conditions.Add(endInclusive ? $"{column} > @from AND {column} <= @to" : $"{column} >= @from AND {column} < @to");
        }

        if (target.Where is not null)
        {
            conditions.Add($"({target.Where})");
        }

        return conditions.Count == 0 ? string.Empty : " WHERE " + string.Join(" AND ", conditions);
    }
}
