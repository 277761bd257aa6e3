using DriftWatch.Core.Configuration;
using DriftWatch.Core.History;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.IntegrationTests.Store;
using DriftWatch.Sources;
using DriftWatch.Sources.Postgres;
using DriftWatch.Store;
using static DriftWatch.IntegrationTests.Sources.TestPairs;

namespace DriftWatch.IntegrationTests.Sources.Postgres;

/// <summary>
/// The shared read of several pairs of one table (<see cref="IGroupSource"/>) against two oracles: PostgreSQL's
/// own count/avg/var_samp/corr/regr_slope/regr_intercept aggregates over each pair's finite rows, and the read of
/// each pair alone (<see cref="IPairSource.SampleAsync"/>), which must give the same sample and the same figures.
/// </summary>
[Collection(UsesPostgres.Name)]
public sealed class PostgresGroupTests(PostgresServer server) : PostgresSourceTestBase(server)
{
    /// <summary>Relative agreement required of every figure (the brief's bar; the shared sums are exact to about 1e-13).</summary>
    private const double Tolerance = 1e-9;

    // Columns of every kind the source reads: float8, a large offset with a small spread, numeric, bigint, and one
    // with nulls, NaN and infinities; label is text.
    private static readonly (string X, string Y)[] Columns =
        [("a", "b"), ("a", "c"), ("b", "c"), ("big", "a"), ("n", "b"), ("g", "a"), ("g", "big"), ("i8", "c"), ("c", "g")];

    protected override Task SeedAsync() => Db.ExecuteAsync("""
        CREATE TABLE gauges (id integer, a float8, b float8, c float8, big float8, n numeric(16, 4), g float8, i8 bigint, label text);
        SELECT setseed(0.5);
        INSERT INTO gauges
        SELECT i, r, 2 * r + random(), random() * 10 - 5, 1e9 + random(), (random() * 1000)::numeric(16, 4),
               CASE WHEN i % 50 = 0 THEN NULL WHEN i % 77 = 0 THEN 'NaN' WHEN i % 91 = 0 THEN 'Infinity' ELSE r * r + random() END,
               i::bigint * 3000000000, 'g' || i
        FROM (SELECT i, random() AS r FROM generate_series(1, 20000) AS i) s;
        INSERT INTO gauges VALUES (20001, NULL, 1, 2, 1e9, NULL, 3, NULL, 'gap'), (20002, '-Infinity', 'NaN', 1, 1e9, 'NaN', 2, 7, 'odd');
        ANALYZE gauges;
        """);

    [Fact]
    public async Task SharedRead_FiguresOfEveryPair_EqualPostgresAggregates()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var pairs = Pairs(new SampleSpec { Rows = 500 });

        var reads = await source.SampleGroupAsync(pairs, Now, CancellationToken.None);

        for (var i = 0; i < pairs.Count; i++)
        {
            var (x, y) = Columns[i];
            var figures = Assert.IsType<SampledPair>(reads[i]?.Value).Figures!;
            // Oracle: PostgreSQL's own aggregates over the rows where both values are finite as float8. Column big
            // (1e9 plus a spread of 1) is translated by exactly 1e9 first (exact in float8: Sterbenz), since
            // PostgreSQL's one-pass sums lose digits on such an offset (Chan, Golub and LeVeque, from memory); the
            // translation is undone on the mean and the intercept.
            double cx = Shift(x), cy = Shift(y);
            string vx = cx == 0 ? x + "::float8" : $"({x}::float8 - 1e9)", vy = cy == 0 ? y + "::float8" : $"({y}::float8 - 1e9)";
            var usable = $"{x}::float8 > '-Infinity' AND {x}::float8 < 'Infinity' AND {y}::float8 > '-Infinity' AND {y}::float8 < 'Infinity'";
            var oracle = (await Db.RowsAsync($"""
                SELECT count(*), count(*) FILTER (WHERE {x} IS NULL OR {y} IS NULL), count(*) FILTER (WHERE {usable}),
                       corr({vy}, {vx}) FILTER (WHERE {usable}), regr_slope({vy}, {vx}) FILTER (WHERE {usable}),
                       regr_intercept({vy}, {vx}) FILTER (WHERE {usable}), avg({vx}) FILTER (WHERE {usable}),
                       avg({vy}) FILTER (WHERE {usable}), var_samp({vx}) FILTER (WHERE {usable}), var_samp({vy}) FILTER (WHERE {usable})
                FROM gauges
                """))[0];
            oracle[5] += cy - (oracle[4] * cx);
            oracle[6] += cx;
            oracle[7] += cy;
            Assert.Equal(20_002, figures.RowCount);
            Assert.Equal((long)oracle[0]!.Value, figures.RowCount);
            Assert.Equal((long)oracle[1]!.Value, figures.NullCount);
            Assert.Equal((long)oracle[2]!.Value, figures.UsedCount);
            AssertClose(oracle[3], figures.PearsonR, $"{x},{y} r");
            AssertClose(oracle[4], figures.Slope, $"{x},{y} slope");
            AssertClose(oracle[5], figures.Intercept, $"{x},{y} intercept", InterceptScale(figures));
            AssertClose(oracle[6], figures.XMean, $"{x},{y} mean x");
            AssertClose(oracle[7], figures.YMean, $"{x},{y} mean y");
            AssertClose(oracle[8], figures.XVariance, $"{x},{y} var x");
            AssertClose(oracle[9], figures.YVariance, $"{x},{y} var y");
        }
    }

    [Theory]
    [InlineData(SampleMethod.All, null)]
    [InlineData(SampleMethod.Random, 17)]
    public async Task SharedRead_OfEveryPair_EqualsItsReadAlone(SampleMethod method, int? seed)
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var pairs = Pairs(new SampleSpec { Method = method, Rows = 2000, Seed = seed });

        var reads = await source.SampleGroupAsync(pairs, Now, CancellationToken.None);

        for (var i = 0; i < pairs.Count; i++)
        {
            var shared = Assert.IsType<SampledPair>(reads[i]?.Value);
            var alone = await source.SampleAsync(pairs[i], Now, CancellationToken.None);
            // The same rows, in the same order, with the same counts of dropped values.
            Assert.Equal(alone.Sample.X, shared.Sample.X);
            Assert.Equal(alone.Sample.Y, shared.Sample.Y);
            Assert.Equal((alone.Sample.NullCount, alone.Sample.NonFiniteCount), (shared.Sample.NullCount, shared.Sample.NonFiniteCount));
            Assert.Equal(alone.Method, shared.Method);
            AssertSameFigures(alone.Figures!, shared.Figures!, pairs[i].Name);
        }
    }

    [Theory]
    [InlineData("a:b a:c b:c big:c")] // a and b have unusable rows from the start: the full form, lean for big/c only
    [InlineData("big:c c:big")] // every column finite: the lean statement, then the NaN in c is caught by its sums
    public async Task SharedRead_Later_LeanFormStillEqualsTheReadsAlone_WhenValuesGoMissing(string columns)
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var pairs = columns.Split(' ').Select(c => (c.Split(':')[0], c.Split(':')[1]))
            .Select(c => Table("gauges", c.Item1, c.Item2, new SampleSpec { Method = SampleMethod.All }) with { Name = $"{c.Item1}_{c.Item2}" })
            .ToList();

        // Every column finite on every row: the next read sums only Σ dx·dy per pair and checks that assumption.
        await AssertEqualsAloneAsync();
        await AssertEqualsAloneAsync();
        await Db.ExecuteAsync("UPDATE gauges SET b = NULL WHERE id = 5; UPDATE gauges SET c = 'NaN' WHERE id = 6; UPDATE gauges SET a = 'Infinity' WHERE id = 7");
        await AssertEqualsAloneAsync();
        await AssertEqualsAloneAsync();

        async Task AssertEqualsAloneAsync()
        {
            var reads = await source.SampleGroupAsync(pairs, Now, CancellationToken.None);
            for (var i = 0; i < pairs.Count; i++)
            {
                var alone = await source.SampleAsync(pairs[i], Now, CancellationToken.None);
                AssertSameFigures(alone.Figures!, Assert.IsType<SampledPair>(reads[i]?.Value).Figures!, pairs[i].Name);
            }
        }
    }

    /// <summary>
    /// Column hints kept in a real store: a fresh source (a restarted worker, another worker) starts from what an
    /// earlier source learned, so its first read is the shared aggregate alone, where a source without hints first
    /// surveys the columns (column big, 10⁹ plus a spread of 1, needs a reference near its mean); a wrong hint
    /// costs scans, never a figure.
    /// </summary>
    [Fact]
    public async Task SharedRead_FreshSourceWithStoredHints_ScansOnce_AndAWrongHintNeverChangesAFigure()
    {
        await using var store = new SqliteStoreDatabaseFactory();
        var database = await store.CreateAsync();
        await new MigrationRunner(database).MigrateAsync(CancellationToken.None);
        var hints = new KeysSeen(new ColumnHintStore(database));
        var pairs = new[] { ("big", "c"), ("c", "big"), ("a", "big") }
            .Select(c => Table("gauges", c.Item1, c.Item2, new SampleSpec { Method = SampleMethod.All }) with { Name = $"{c.Item1}_{c.Item2}" })
            .ToList();

        await using var first = new PostgresPairSource(PgSource(Db.ConnectionString), hints);
        var firstReads = await first.SampleGroupAsync(pairs, Now, CancellationToken.None);
        Assert.Equal(2, first.AggregateScans);

        // A fresh source with the store's hints: one scan, the same figures as the first source and as each pair alone.
        await using var second = new PostgresPairSource(PgSource(Db.ConnectionString), hints);
        var secondReads = await second.SampleGroupAsync(pairs, Now, CancellationToken.None);
        Assert.Equal(1, second.AggregateScans);
        // Control: a fresh source without the store needs the second scan again.
        await using var alone = new PostgresPairSource(PgSource(Db.ConnectionString));
        await alone.SampleGroupAsync(pairs, Now, CancellationToken.None);
        Assert.Equal(2, alone.AggregateScans);
        for (var i = 0; i < pairs.Count; i++)
        {
            var own = await alone.SampleAsync(pairs[i], Now, CancellationToken.None);
            AssertSameFigures(own.Figures!, firstReads[i]!.Value.Figures!, pairs[i].Name);
            AssertSameFigures(own.Figures!, secondReads[i]!.Value.Figures!, pairs[i].Name);
        }

        // Wrong hints: every column said finite throughout (a has a null and an infinity) with a mean far off.
        await hints.WriteAsync(PgSource(Db.ConnectionString).Name, hints.Keys.ToDictionary(k => k, _ => new ColumnHint(-5e8, true)), Now, CancellationToken.None);
        await using var misled = new PostgresPairSource(PgSource(Db.ConnectionString), hints);
        var misledReads = await misled.SampleGroupAsync(pairs, Now, CancellationToken.None);
        Assert.True(misled.AggregateScans >= 2, $"{misled.AggregateScans} scans");
        for (var i = 0; i < pairs.Count; i++)
        {
            var own = await alone.SampleAsync(pairs[i], Now, CancellationToken.None);
            AssertSameFigures(own.Figures!, misledReads[i]!.Value.Figures!, pairs[i].Name);
        }
    }

    [Fact]
    public async Task SharedRead_WithWindowAndFilter_EqualsTheReadsAlone()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var window = new WindowSpec("ts", TimeSpan.FromHours(6));
        var pairs = new[] { ("x", "y"), ("y", "x"), ("id", "y") }
            .Select((c, i) => Table("readings", c.Item1, c.Item2, new SampleSpec { Method = SampleMethod.All }, window, where: "id % 3 <> 0") with { Name = $"w{i}" })
            .ToList();

        var reads = await source.SampleGroupAsync(pairs, Now, CancellationToken.None);

        for (var i = 0; i < pairs.Count; i++)
        {
            var shared = Assert.IsType<SampledPair>(reads[i]?.Value);
            var alone = await source.SampleAsync(pairs[i], Now, CancellationToken.None);
            Assert.Equal(14_400, shared.Figures!.RowCount);
            Assert.Equal(alone.Sample.X, shared.Sample.X);
            AssertSameFigures(alone.Figures!, shared.Figures!, pairs[i].Name);
        }
    }

    [Theory]
    [InlineData("SELECT i::float8 AS x, 5::float8 AS y, (i % 2)::float8 AS z FROM generate_series(1, 50) AS i", 50)] // a constant column
    [InlineData("SELECT 3::float8 AS x, 4::float8 AS y, 7::float8 AS z", 1)] // one row
    [InlineData("SELECT 1::float8 AS x, 2::float8 AS y, 3::float8 AS z WHERE false", 0)] // no row
    public async Task SharedRead_DegenerateData_GivesTheNullsOfTheReadsAlone(string rows, long count)
    {
        await Db.ExecuteAsync($"CREATE TABLE edge AS {rows}");
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var pairs = new[] { ("x", "y"), ("y", "z"), ("x", "z") }
            .Select(c => Table("edge", c.Item1, c.Item2, new SampleSpec { Method = SampleMethod.All }) with { Name = c.Item1 + c.Item2 })
            .ToList();

        // Twice: the first read starts from reference 0, the second from the remembered means (lean form).
        for (var round = 0; round < 2; round++)
        {
            var reads = await source.SampleGroupAsync(pairs, Now, CancellationToken.None);
            for (var i = 0; i < pairs.Count; i++)
            {
                // Oracle: the read alone, whose figures are PostgreSQL's own aggregates (NULL r and slope for a
                // constant column, NULL variances for one row, NULL means for none).
                var alone = await source.SampleAsync(pairs[i], Now, CancellationToken.None);
                Assert.Equal(count, alone.Figures!.RowCount);
                AssertSameFigures(alone.Figures!, Assert.IsType<SampledPair>(reads[i]?.Value).Figures!, pairs[i].Name);
            }
        }
    }

    [Fact]
    public async Task SharedRead_PairWithATextColumn_IsLeftToItsOwnCheck()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var pairs = new List<PairConfig>
        {
            Table("gauges", "a", "b", new SampleSpec { Method = SampleMethod.All }) with { Name = "ok" },
            Table("gauges", "a", "label", new SampleSpec { Method = SampleMethod.All }) with { Name = "text" },
        };

        var reads = await source.SampleGroupAsync(pairs, Now, CancellationToken.None);

        Assert.Null(reads[1]);
        var alone = await source.SampleAsync(pairs[0], Now, CancellationToken.None);
        AssertSameFigures(alone.Figures!, reads[0]!.Value.Figures!, "ok");
        var error = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(pairs[1], Now, CancellationToken.None));
        Assert.Equal(SourceFailure.NonNumericColumn, error.Failure);
    }

    [Fact]
    public async Task SharedRead_MissingColumn_FailsAsAWhole()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var pairs = new List<PairConfig> { Table("gauges", "a", "b") with { Name = "ok" }, Table("gauges", "a", "nope") with { Name = "gone" } };

        var error = await Assert.ThrowsAsync<SourceException>(() => source.SampleGroupAsync(pairs, Now, CancellationToken.None));

        Assert.Equal(SourceFailure.MissingColumn, error.Failure);
    }

    private static double Shift(string column) => column == "big" ? 1e9 : 0;

    private static List<PairConfig> Pairs(SampleSpec sample) =>
        [.. Columns.Select(c => Table("gauges", c.X, c.Y, sample) with { Name = $"gauges.{c.X}_{c.Y}" })];

    internal static void AssertSameFigures(SourceFigures expected, SourceFigures actual, string pair)
    {
        Assert.Equal((expected.RowCount, expected.UsedCount, expected.NullCount), (actual.RowCount, actual.UsedCount, actual.NullCount));
        AssertClose(expected.PearsonR, actual.PearsonR, pair + " r");
        AssertClose(expected.Slope, actual.Slope, pair + " slope");
        AssertClose(expected.Intercept, actual.Intercept, pair + " intercept", InterceptScale(expected));
        AssertClose(expected.XMean, actual.XMean, pair + " mean x");
        AssertClose(expected.YMean, actual.YMean, pair + " mean y");
        AssertClose(expected.XVariance, actual.XVariance, pair + " var x");
        AssertClose(expected.YVariance, actual.YVariance, pair + " var y");
    }

    /// <summary>
    /// The intercept ȳ − b·x̄ is the difference of two terms that may be far larger than it (a line read far from
    /// its data): any engine loses digits in proportion to them, so it is compared relative to |b·x̄|.
    /// </summary>
    private static double InterceptScale(SourceFigures f) => f.Slope is { } b && f.XMean is { } m ? Math.Abs(b * m) : 0;

    private static void AssertClose(double? expected, double? actual, string what, double scale = 0)
    {
        Assert.True(expected.HasValue == actual.HasValue, $"{what}: expected {expected}, got {actual}");
        if (expected is { } e && actual is { } a)
        {
            Assert.True(Math.Abs(a - e) <= Tolerance * Math.Max(Math.Max(Math.Abs(e), scale), 1e-300), $"{what}: expected {e:R}, got {a:R}");
        }
    }

    /// <summary>The real hint store, noting the keys the source asked for (the test then writes wrong hints under them).</summary>
    private sealed class KeysSeen(IColumnHints inner) : IColumnHints
    {
        public HashSet<string> Keys { get; } = new(StringComparer.Ordinal);

        public Task<IReadOnlyDictionary<string, ColumnHint>> ReadAsync(string source, IReadOnlyCollection<string> keys, CancellationToken cancellationToken)
        {
            Keys.UnionWith(keys);
            return inner.ReadAsync(source, keys, cancellationToken);
        }

        public Task WriteAsync(string source, IReadOnlyDictionary<string, ColumnHint> hints, DateTimeOffset readAt, CancellationToken cancellationToken) =>
            inner.WriteAsync(source, hints, readAt, cancellationToken);
    }
}
