using DriftWatch.Core.Configuration;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Sources.Postgres;
using MathNet.Numerics;
using MathNet.Numerics.Statistics;
using static DriftWatch.IntegrationTests.Sources.TestPairs;

namespace DriftWatch.IntegrationTests.Sources.Postgres;

/// <summary>
/// Push-down figures against two oracles: PostgreSQL's own aggregates queried directly (bit-equal, parallel
/// aggregation is off in test databases), and MathNet.Numerics over every row read back.
/// </summary>
[Collection(UsesPostgres.Name)]
public sealed class PostgresFiguresTests(PostgresServer server) : PostgresSourceTestBase(server)
{
    protected override Task SeedAsync() => Db.ExecuteAsync("""
        CREATE TABLE noisy (id integer, x float8, y float8);
        SELECT setseed(0.25);
        INSERT INTO noisy SELECT i, i / 100.0 + random(), 0.5 * i / 100.0 + 4 * random() FROM generate_series(1, 20000) AS i;
        INSERT INTO noisy VALUES (20001, NULL, 1), (20002, 2, NULL), (20003, NULL, NULL),
            (20004, 'NaN', 1), (20005, 1, 'Infinity'), (20006, '-Infinity', 3);
        CREATE TABLE typed (i2 smallint, i4 integer, i8 bigint, num numeric(14, 4), r4 real, f8 float8);
        INSERT INTO typed SELECT i, i * 1000, i::bigint * 3000000000, i / 7.0, i / 3.0, i / 9.0 FROM generate_series(-50, 50) AS i;
        INSERT INTO typed VALUES (1, 1, 1, 'NaN', 1, 1);
        ANALYZE noisy; ANALYZE typed;
        """);

    [Fact]
    public async Task Figures_EqualPostgresAggregatesOverTheFiniteRows()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var figures = (await source.SampleAsync(Table("noisy", sample: new SampleSpec { Rows = 500 }), Now, CancellationToken.None)).Figures!;

        // Oracle: PostgreSQL's corr/regr_*/avg/var_samp over the rows where both values are finite.
        var oracle = (await Db.RowsAsync("""
            SELECT count(*), corr(y, x), regr_slope(y, x), regr_intercept(y, x), avg(x), avg(y), var_samp(x), var_samp(y)
            FROM noisy WHERE x IS NOT NULL AND y IS NOT NULL AND x NOT IN ('NaN', 'Infinity', '-Infinity') AND y NOT IN ('NaN', 'Infinity', '-Infinity')
            """))[0];
        Assert.Equal(20_006, figures.RowCount);
        Assert.Equal(3, figures.NullCount);
        Assert.Equal((long)oracle[0]!.Value, figures.UsedCount);
        Assert.Equal(20_000, figures.UsedCount);
        Assert.Equal(oracle[1], figures.PearsonR);
        Assert.Equal(oracle[2], figures.Slope);
        Assert.Equal(oracle[3], figures.Intercept);
        Assert.Equal(oracle[4], figures.XMean);
        Assert.Equal(oracle[5], figures.YMean);
        Assert.Equal(oracle[6], figures.XVariance);
        Assert.Equal(oracle[7], figures.YVariance);
    }

    [Fact]
    public async Task Figures_AgreeWithMathNetOverEveryRow()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var all = await source.SampleAsync(Table("noisy", sample: new SampleSpec { Method = SampleMethod.All }), Now, CancellationToken.None);
        var figures = all.Figures!;

        // The sample of every row drops what the figures drop: 3 rows with a null, 3 with a non-finite value.
        Assert.Equal(3, all.Sample.NullCount);
        Assert.Equal(3, all.Sample.NonFiniteCount);
        Assert.Equal(figures.UsedCount, all.Sample.UsedCount);

        // Oracle: MathNet.Numerics (Pearson, least-squares line, sample variance) on the same rows.
        var (intercept, slope) = Fit.Line(all.Sample.X, all.Sample.Y);
        AssertClose(Correlation.Pearson(all.Sample.X, all.Sample.Y), figures.PearsonR);
        AssertClose(slope, figures.Slope);
        AssertClose(intercept, figures.Intercept);
        AssertClose(all.Sample.X.Mean(), figures.XMean);
        AssertClose(all.Sample.Y.Variance(), figures.YVariance);

        // And the engine's own profile of the same rows agrees with the database's push-down.
        var profile = DriftWatch.Core.Profiling.Profiler.Profile(all.Sample, DriftWatch.Core.Statistics.Thresholds.Default);
        AssertClose(figures.PearsonR!.Value, profile.PearsonR);
        AssertClose(figures.Slope!.Value, profile.Slope);
        AssertClose(figures.Intercept!.Value, profile.Intercept);
        Assert.Equal(figures.UsedCount, profile.NUsed);
        Assert.Equal(figures.RowCount, profile.NRows);
    }

    [Fact]
    public async Task Figures_WithWindow_CoverTheWindowOnly()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var figures = (await source.SampleAsync(Table("readings", window: new WindowSpec("ts", TimeSpan.FromHours(6))), Now, CancellationToken.None)).Figures!;

        var oracle = (await Db.RowsAsync("""
            SELECT count(*), corr(y, x), regr_slope(y, x), regr_intercept(y, x)
            FROM readings WHERE ts >= '2026-03-01 18:00:00+00' AND ts < '2026-03-02 00:00:00+00'
            """))[0];
        Assert.Equal(21_600, figures.RowCount);
        Assert.Equal((long)oracle[0]!.Value, figures.RowCount);
        Assert.Equal(oracle[1], figures.PearsonR);
        Assert.Equal(oracle[2], figures.Slope);
        Assert.Equal(oracle[3], figures.Intercept);
    }

    [Theory]
    [InlineData("i2", "i4")]
    [InlineData("i8", "num")]
    [InlineData("r4", "f8")]
    public async Task Values_OfEveryNumericType_ReadAsTheirFloat8Value(string x, string y)
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var result = await source.SampleAsync(Table("typed", x, y, new SampleSpec { Method = SampleMethod.All }), Now, CancellationToken.None);

        // Oracle: PostgreSQL's own cast to float8; numeric 'NaN' is a non-finite value, not an error.
        var expected = await Db.RowsAsync($"SELECT {x}::float8, {y}::float8 FROM typed WHERE {x}::float8 <> 'NaN' AND {y}::float8 <> 'NaN'");
        Assert.Equal(expected.Select(r => (r[0]!.Value, r[1]!.Value)).Order(), result.Sample.X.Zip(result.Sample.Y).Order());
        Assert.Equal(y == "num" ? 1 : 0, result.Sample.NonFiniteCount);
    }

    [Fact]
    public async Task Figures_ZeroVariance_AreNullNotNaN()
    {
        await Db.ExecuteAsync("CREATE TABLE flat AS SELECT i::float8 AS x, 5.0::float8 AS y FROM generate_series(1, 10) AS i");
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var figures = (await source.SampleAsync(Table("flat"), Now, CancellationToken.None)).Figures!;

        // PostgreSQL's corr() is NULL when a variance is zero (PostgreSQL manual, aggregate functions for statistics).
        Assert.Null(figures.PearsonR);
        Assert.Equal(0.0, figures.Slope);
        Assert.Equal(0.0, figures.YVariance);
        Assert.Equal(10, figures.UsedCount);
    }

    private static void AssertClose(double expected, double? actual) =>
        Assert.True(actual is { } a && Math.Abs(a - expected) <= 1e-9 * Math.Max(1, Math.Abs(expected)), $"expected {expected:R}, got {actual:R}");

}
