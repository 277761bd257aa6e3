using System.Globalization;
using System.Text;
using NpgsqlTypes;

namespace DriftWatch.Sources.Postgres;

/// <summary>
/// The SQL of a group's shared read (pairs of one table or query with the same filter, window and sampling):
/// the FROM and WHERE are those of <paramref name="shared"/>, the pairs' columns are <paramref name="columns"/>
/// (quoted), each pair names two of them by index. The aggregate tests each column for finiteness and shifts it
/// once per row, in a subquery kept from being flattened (see <see cref="Fence"/>), and sums per column once;
/// only Σ dx·dy and the sums over each pair's unusable rows are per pair. Results come as one float8[] per
/// column and per pair, which keeps the output far below PostgreSQL's 1,664 columns.
/// </summary>
internal sealed class PostgresGroupSql(PostgresPairSql shared, PairTarget target, IReadOnlyList<string> columns, IReadOnlyList<(int X, int Y)> pairs, IReadOnlyList<bool> numeric)
{
    /// <summary>
    /// A volatile, parallel-safe column in a subquery's select list. PostgreSQL pulls a plain subquery up into the
    /// outer query and then computes each shifted value again inside every aggregate that uses it (a column of 100
    /// pairs about ten times per row); a volatile function there keeps the subquery a level of its own, whose values
    /// the scan computes once per row. Unlike <c>OFFSET 0</c>, which does the same, it leaves PostgreSQL free to run
    /// the aggregate as a parallel scan. On 1M rows × 20 columns × 100 pairs (PostgreSQL 15, 2 cores): lean form
    /// 1.7 → 1.2 s, full form 8.8 → 5.0 s. The value itself is never read.
    /// </summary>
    internal const string Fence = "clock_timestamp() AS keep_level";

    /// <summary>Zero rows: the server resolves the relation, the columns and the filter, and reports their types (window column last).</summary>
    public (string Sql, PositionalParameters Parameters) Probe()
    {
        var p = new PositionalParameters();
        var list = columns.Select(shared.Column).ToList();
        if (target.WindowColumn is not null)
        {
            list.Add(shared.Column(target.WindowColumn));
        }

        return ($"SELECT {string.Join(", ", list)} FROM {shared.From()}{shared.Where(p, withWindow: false)} LIMIT 0", p);
    }

    /// <summary>
    /// Row count, then per column ARRAY[finite count, Σd, Σd², null count], then per pair ARRAY[Σ dx·dy, unusable
    /// rows, rows with a null, Σdx and Σdx² where y is unusable, Σdy and Σdy² where x is unusable], with
    /// d = value − <paramref name="references"/>[column] on finite values and 0 elsewhere (see <see cref="GroupFigures"/>).
    /// A pair not marked in <paramref name="full"/> gets ARRAY[Σ dx·dy] only: enough when both its columns turn out
    /// finite on every row (their finite counts equal the row count), which the caller checks.
    /// </summary>
    public (string Sql, PositionalParameters Parameters) Aggregate(IReadOnlyList<double> references, IReadOnlyList<bool> full)
    {
        ArgumentNullException.ThrowIfNull(references);
        ArgumentNullException.ThrowIfNull(full);
        var p = new PositionalParameters();
        var inner = new StringBuilder();
        for (var c = 0; c < columns.Count; c++)
        {
            var v = "v.c" + Text(c);
            var finite = $"({v} > '-Infinity'::float8 AND {v} < 'Infinity'::float8)";
            inner.Append(c == 0 ? string.Empty : ",\n       ")
                .Append(CultureInfo.InvariantCulture, $"{v} IS NULL AS n{Text(c)}, {finite} IS TRUE AS f{Text(c)}, ")
                .Append(CultureInfo.InvariantCulture, $"CASE WHEN {finite} THEN {v} - {p.Add(references[c], NpgsqlDbType.Double)} ELSE 0::float8 END AS d{Text(c)}");
        }

        var outer = new StringBuilder("count(*)");
        for (var c = 0; c < columns.Count; c++)
        {
            var i = Text(c);
            outer.Append(CultureInfo.InvariantCulture, $",\n       ARRAY[count(*) FILTER (WHERE d.f{i}), sum(d.d{i}), sum(d.d{i} * d.d{i}), count(*) FILTER (WHERE d.n{i})]::float8[]");
        }

        for (var k = 0; k < pairs.Count; k++)
        {
            var (x, y) = pairs[k];
            string a = Text(x), b = Text(y);
            if (!full[k])
            {
                outer.Append(CultureInfo.InvariantCulture, $",\n       ARRAY[sum(d.d{a} * d.d{b})]::float8[]");
                continue;
            }

            outer.Append(CultureInfo.InvariantCulture, $",\n       ARRAY[sum(d.d{a} * d.d{b}), count(*) FILTER (WHERE NOT (d.f{a} AND d.f{b})), count(*) FILTER (WHERE d.n{a} OR d.n{b}), ")
                .Append(CultureInfo.InvariantCulture, $"sum(d.d{a}) FILTER (WHERE NOT d.f{b}), sum(d.d{a} * d.d{a}) FILTER (WHERE NOT d.f{b}), ")
                .Append(CultureInfo.InvariantCulture, $"sum(d.d{b}) FILTER (WHERE NOT d.f{a}), sum(d.d{b} * d.d{b}) FILTER (WHERE NOT d.f{a})]::float8[]");
        }

        // The values subquery is built after the references so the parameters keep their order in the text.
        var values = Values(p, null);
        var sql = $"""
            SELECT {outer}
            FROM (SELECT {inner}, {Fence}
                  FROM ({values}) v) d
            """;
        return (sql, p);
    }

    /// <summary>
    /// The lean form, for a group whose columns were all finite on every row at the last read: no finiteness test.
    /// Row count, per column ARRAY[count of non-null values, Σd, Σd²], per pair ARRAY[Σ dx·dy], d = value −
    /// reference. A null shows in the count, a NaN or an infinity makes the column's sums non-finite: either way the
    /// caller sees that the assumption failed.
    /// </summary>
    public (string Sql, PositionalParameters Parameters) Lean(IReadOnlyList<double> references)
    {
        ArgumentNullException.ThrowIfNull(references);
        var p = new PositionalParameters();
        var inner = new StringBuilder();
        for (var c = 0; c < columns.Count; c++)
        {
            inner.Append(CultureInfo.InvariantCulture, $"{PostgresPairSql.Float8(shared.Column(columns[c]), numeric[c])} - {p.Add(references[c], NpgsqlDbType.Double)} AS d{Text(c)}, ");
        }

        var outer = new StringBuilder("count(*)");
        for (var c = 0; c < columns.Count; c++)
        {
            var i = Text(c);
            outer.Append(CultureInfo.InvariantCulture, $",\n       ARRAY[count(d.d{i}), sum(d.d{i}), sum(d.d{i} * d.d{i})]::float8[]");
        }

        foreach (var (x, y) in pairs)
        {
            outer.Append(CultureInfo.InvariantCulture, $",\n       ARRAY[sum(d.d{Text(x)} * d.d{Text(y)})]::float8[]");
        }

        return ($"SELECT {outer}\nFROM (SELECT {inner}{Fence}\n      FROM {shared.From()}{shared.Where(p)}) d", p);
    }

    /// <summary>
    /// A first look at columns nothing is known of yet (no earlier read, no hint in the store): row count, then per
    /// column of <paramref name="which"/> ARRAY[finite values, their mean]. Three plain aggregates per column, which
    /// PostgreSQL may run as a parallel scan: far cheaper than a full-form statement shifted by 0 that may have to
    /// run twice. The mean only serves as the reference, so float8's own <c>avg</c> is close enough.
    /// </summary>
    public (string Sql, PositionalParameters Parameters) Survey(IReadOnlyList<int> which)
    {
        ArgumentNullException.ThrowIfNull(which);
        var p = new PositionalParameters();
        var outer = new StringBuilder("count(*)");
        foreach (var c in which)
        {
            var v = PostgresPairSql.Float8(shared.Column(columns[c]), numeric[c]);
            var finite = $"({v} > '-Infinity'::float8 AND {v} < 'Infinity'::float8)";
            outer.Append(CultureInfo.InvariantCulture, $",\n       ARRAY[count(*) FILTER (WHERE {finite}), avg({v}) FILTER (WHERE {finite})]::float8[]");
        }

        return ($"SELECT {outer}\nFROM {shared.From()}{shared.Where(p)}", p);
    }

    /// <summary>The rows of the sample with every column of the group, drawn as <see cref="PostgresPairSql.Sample"/> draws one pair's.</summary>
    public (string Sql, PositionalParameters Parameters) Sample(SamplePlan plan, int rows, int? seed, bool bernoulli)
    {
        ArgumentNullException.ThrowIfNull(plan);
        var p = new PositionalParameters();
        switch (plan.Draw)
        {
            case SampleDraw.All:
                return (Values(p, null), p);
            case SampleDraw.Random:
                return (PostgresPairSql.RandomDraw(Values(p, null), plan.Keep, rows, p), p);
            default:
                var method = bernoulli ? "BERNOULLI" : "SYSTEM";
                var tablesample = $" TABLESAMPLE {method} ({p.Add((float)plan.Percent!.Value, NpgsqlDbType.Real)})";
                if (seed is { } s)
                {
                    tablesample += $" REPEATABLE ({p.Add((double)s, NpgsqlDbType.Double)})";
                }

                return (Values(p, tablesample) + " ORDER BY random() LIMIT " + p.Add(rows, NpgsqlDbType.Integer), p);
        }
    }

    private string Values(PositionalParameters p, string? tablesample)
    {
        var list = columns.Select((c, i) => $"{PostgresPairSql.Float8(shared.Column(c), numeric[i])} AS c{Text(i)}");
        return $"SELECT {string.Join(", ", list)} FROM {shared.From()}{tablesample}{shared.Where(p)}";
    }

    private static string Text(int i) => i.ToString(CultureInfo.InvariantCulture);
}
