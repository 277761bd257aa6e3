using DriftWatch.Core.Configuration;
using DriftWatch.Core.Profiling;
using DriftWatch.Sources;
using DriftWatch.Sources.Sqlite;
using MathNet.Numerics;
using MathNet.Numerics.Statistics;
using static DriftWatch.IntegrationTests.Sources.TestPairs;

namespace DriftWatch.IntegrationTests.Sources.Sqlite;

/// <summary>
/// The SQLite source on a real database file. Row i (1..100 000) has x = i, y = 3i + (i mod 7) and its time
/// 2026-03-01 00:00 UTC + i seconds stored three ways: ISO text with a space, ISO text with T and Z, Unix seconds.
/// </summary>
public sealed class SqliteSourceTests : IDisposable
{
    private const int Rows = 100_000;
    private readonly SqliteFile _db = new();

    public SqliteSourceTests()
    {
        _db.Execute($"""
            CREATE TABLE readings (id INTEGER PRIMARY KEY, x REAL, y REAL, ts_space TEXT, ts_t TEXT, ts_unix INTEGER, label TEXT);
            WITH RECURSIVE n(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM n WHERE i < {Rows})
            INSERT INTO readings SELECT i, i, 3 * i + (i % 7),
                   datetime(1772323200 + i, 'unixepoch'), strftime('%Y-%m-%dT%H:%M:%SZ', 1772323200 + i, 'unixepoch'), 1772323200 + i, 'r' || i
            FROM n;
            CREATE TABLE small AS SELECT * FROM readings WHERE id <= 500;
            CREATE TABLE messy (a, b);
            INSERT INTO messy VALUES (1, 2.5), (2, 4.5), (3, 6.0), (4, 9.5), (5, 10.0), (NULL, 1), (6, NULL), ('n/a', 3), (7, 9e999);
            CREATE TABLE words (a, b);
            INSERT INTO words VALUES (1, 'one'), (2, 'two');
            CREATE TABLE victim (x REAL, y REAL);
            INSERT INTO victim SELECT id, id FROM readings WHERE id <= 100;
            CREATE TABLE x (a INTEGER);
            """);
    }

    public void Dispose() => _db.Dispose();

    private SqlitePairSource Source(TimeSpan? timeout = null) => new(SqliteSource(_db.Path, timeout));

    private static void AssertRealDistinctRows(PairedSample sample)
    {
        for (var i = 0; i < sample.UsedCount; i++)
        {
            Assert.InRange(sample.X[i], 1, Rows);
            Assert.Equal((3 * sample.X[i]) + (sample.X[i] % 7), sample.Y[i]);
        }

        Assert.Equal(sample.UsedCount, sample.X.Distinct().Count());
    }

    [Fact]
    public async Task Auto_LargeTable_SamplesByRandom()
    {
        using var source = Source();

        var result = await source.SampleAsync(Table("readings"), Now, CancellationToken.None);

        Assert.Equal("random 10000", result.Method);
        Assert.Equal(10_000, result.Sample.UsedCount);
        AssertRealDistinctRows(result.Sample);
        Assert.Equal(Rows, result.Figures!.RowCount);
    }

    [Fact]
    public async Task Seed_DrawsARepeatableReservoir()
    {
        using var source = Source();
        var pair = Table("readings", sample: new SampleSpec { Rows = 3000, Seed = 5, Method = SampleMethod.Tablesample });

        var first = await source.SampleAsync(pair, Now, CancellationToken.None);
        var second = await source.SampleAsync(pair, Now, CancellationToken.None);

        Assert.Equal("reservoir 3000 seed 5 (SQLite has no table sampling)", first.Method);
        Assert.Equal(first.Sample.X, second.Sample.X);
        AssertRealDistinctRows(first.Sample);
    }

    [Fact]
    public async Task SmallTable_IsReadWhole()
    {
        using var source = Source();

        var result = await source.SampleAsync(Table("small"), Now, CancellationToken.None);

        Assert.Equal("all 500", result.Method);
        Assert.Equal(Enumerable.Range(1, 500).Select(i => (double)i), result.Sample.X.Order());
    }

    [Theory]
    [InlineData("ts_space")]
    [InlineData("ts_t")]
    [InlineData("ts_unix")]
    public async Task Window_OnIsoTextOrUnixSeconds_KeepsTheLastPeriod(string column)
    {
        using var source = Source();

        var result = await source.SampleAsync(Table("readings", window: new WindowSpec(column, TimeSpan.FromHours(1)), where: "id % 2 = 0"), Now, CancellationToken.None);

        // Oracle: SQLite's own date functions reading each stored form (sqlite.org/lang_datefunc.html).
        var expected = _db.Scalar<long>($"SELECT count(*) FROM readings WHERE unixepoch({column}{(column == "ts_unix" ? ", 'unixepoch'" : string.Empty)}) >= unixepoch('2026-03-01 23:00:00') AND unixepoch({column}{(column == "ts_unix" ? ", 'unixepoch'" : string.Empty)}) < unixepoch('2026-03-02 00:00:00') AND id % 2 = 0");
        Assert.Equal(1800, expected);
        Assert.Equal(expected, result.Figures!.RowCount);
        Assert.Equal(expected, result.Sample.UsedCount);
        Assert.All(result.Sample.X, x => Assert.InRange(x, 82_800, 86_399));
    }

    [Fact]
    public async Task Figures_AgreeWithMathNet_AndDropCountsMatchTheRows()
    {
        using var source = Source();

        var result = await source.SampleAsync(Table("messy", "a", "b"), Now, CancellationToken.None);
        var figures = result.Figures!;

        // 9 rows: 2 with a null, 1 with text, 1 with +Inf (SQLite's 9e999), 5 usable.
        Assert.Equal(9, figures.RowCount);
        Assert.Equal(2, figures.NullCount);
        Assert.Equal(5, figures.UsedCount);
        Assert.Equal(2, result.Sample.NullCount);
        Assert.Equal(1, result.Sample.NonNumericCount);
        Assert.Equal(1, result.Sample.NonFiniteCount);

        // Oracle: MathNet.Numerics over the five usable points.
        double[] x = [1, 2, 3, 4, 5];
        double[] y = [2.5, 4.5, 6.0, 9.5, 10.0];
        var (intercept, slope) = Fit.Line(x, y);
        Assert.Equal(x, result.Sample.X.Order());
        Assert.Equal(Correlation.Pearson(x, y), figures.PearsonR!.Value, 12);
        Assert.Equal(slope, figures.Slope!.Value, 12);
        Assert.Equal(intercept, figures.Intercept!.Value, 12);
        Assert.Equal(y.Mean(), figures.YMean!.Value, 12);
        Assert.Equal(x.Variance(), figures.XVariance!.Value, 12);
        Assert.Equal(y.Variance(), figures.YVariance!.Value, 12);
    }

    [Fact]
    public async Task Figures_LargeOffset_StayAccurateThanksToCentredSums()
    {
        // Values near 1e9 with unit spread: raw sums of squares lose every digit of the variance in doubles;
        // the two-pass centred formula keeps it. Oracle: MathNet over the same values.
        _db.Execute("""
            CREATE TABLE offset_pairs (x REAL, y REAL);
            WITH RECURSIVE n(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM n WHERE i < 1000)
            INSERT INTO offset_pairs SELECT 1e9 + (i % 10), 1e9 + 2 * (i % 10) + (i % 3) FROM n;
            """);
        using var source = Source();

        var result = await source.SampleAsync(Table("offset_pairs"), Now, CancellationToken.None);

        Assert.Equal(Correlation.Pearson(result.Sample.X, result.Sample.Y), result.Figures!.PearsonR!.Value, 9);
        Assert.Equal(result.Sample.X.Variance(), result.Figures.XVariance!.Value, 6);
    }

    [Fact]
    public async Task TextColumns_AreNonNumeric()
    {
        using var source = Source();

        var declared = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(Table("readings", "x", "label"), Now, CancellationToken.None));
        var stored = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(Table("words", "a", "b"), Now, CancellationToken.None));
        var inQuery = await Assert.ThrowsAsync<SourceException>(() => source.ValidateAsync(Query("SELECT a AS p, b AS q FROM words", "p", "q"), CancellationToken.None));

        Assert.Equal(SourceFailure.NonNumericColumn, declared.Failure);
        Assert.True(declared.Message.Contains("column label is declared TEXT", StringComparison.Ordinal), declared.Message);
        Assert.Equal(SourceFailure.NonNumericColumn, stored.Failure);
        Assert.True(stored.Message.Contains("column b holds text", StringComparison.Ordinal), stored.Message);
        Assert.Equal(SourceFailure.NonNumericColumn, inQuery.Failure);
    }

    [Fact]
    public async Task Session_IsQueryOnly_AndASecondStatementIsRefused()
    {
        using var source = Source();

        var queryOnly = await source.SampleAsync(Table("victim", where: "(SELECT query_only FROM pragma_query_only) = 1"), Now, CancellationToken.None);
        var smuggled = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(Table("victim", where: "1); DELETE FROM victim; SELECT (1"), Now, CancellationToken.None));
        var inQuery = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(Query("SELECT x, y FROM victim) AS q; DELETE FROM victim; SELECT * FROM (SELECT 1 AS x, 1 AS y"), Now, CancellationToken.None));

        Assert.Equal(100, queryOnly.Sample.UsedCount);
        Assert.True(smuggled.Message.Contains("more than one statement", StringComparison.Ordinal), smuggled.Message);
        Assert.Equal(SourceFailure.QueryError, inQuery.Failure);
        Assert.Equal(100, _db.Scalar<long>("SELECT count(*) FROM victim"));
    }

    [Fact]
    public async Task Failures_AreClassified()
    {
        using var source = Source();
        using var missingFile = new SqlitePairSource(SqliteSource(Path.Combine(Path.GetTempPath(), "dw-absent-" + Guid.NewGuid().ToString("N") + ".db")));

        var unreachable = await Assert.ThrowsAsync<SourceException>(() => missingFile.SampleAsync(Table("readings"), Now, CancellationToken.None));
        var table = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(Table("absent_table"), Now, CancellationToken.None));
        var column = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(Table("readings", "x", "vat"), Now, CancellationToken.None));
        var queryColumn = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(Query("SELECT x FROM readings"), Now, CancellationToken.None));
        var queryTable = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(Query("SELECT x, y FROM absent_table"), Now, CancellationToken.None));

        Assert.True(unreachable.Failure == SourceFailure.Unreachable, unreachable.Message);
        Assert.True(table.Failure == SourceFailure.MissingTable, table.Message);
        Assert.Equal(SourceFailure.MissingColumn, column.Failure);
        Assert.True(column.Message.Contains("no column vat", StringComparison.Ordinal), column.Message);
        Assert.True(queryColumn.Failure == SourceFailure.MissingColumn, queryColumn.Message);
        Assert.True(queryTable.Failure == SourceFailure.MissingTable, queryTable.Message);
    }

    [Fact]
    public async Task EndlessQuery_IsInterruptedByTheStatementTimeout()
    {
        using var source = Source(TimeSpan.FromMilliseconds(200));

        var e = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(
            Query("WITH RECURSIVE c(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM c) SELECT i AS x, i AS y FROM c"), Now, CancellationToken.None));

        Assert.Equal(SourceFailure.Timeout, e.Failure);
    }

    [Fact]
    public async Task HostileTableName_IsQuotedHarmlessly()
    {
        using var source = Source();

        var e = await Assert.ThrowsAsync<SourceException>(() => source.SampleAsync(Table("a\"; DROP TABLE x; --"), Now, CancellationToken.None));

        Assert.Equal(SourceFailure.MissingTable, e.Failure);
        Assert.Equal(0, _db.Scalar<long>("SELECT count(*) FROM x"));
    }

    [Fact]
    public async Task Validate_GoodPair_Passes()
    {
        using var source = Source();

        await source.ValidateAsync(Table("readings", window: new WindowSpec("ts_t", TimeSpan.FromDays(1))), CancellationToken.None);
        await source.ValidateAsync(Query("SELECT x AS a, y AS b FROM readings", "a", "b"), CancellationToken.None);
    }
}
