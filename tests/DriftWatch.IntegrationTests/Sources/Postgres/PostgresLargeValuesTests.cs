using DriftWatch.Core.Configuration;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Sources.Postgres;
using static DriftWatch.IntegrationTests.Sources.TestPairs;

namespace DriftWatch.IntegrationTests.Sources.Postgres;

/// <summary>
/// Values at the edges of float8: near 1e300 (their squares overflow PostgreSQL's float8 aggregates), near 1e120
/// (corr() silently returns 0 when Sxx·Syy overflows), numeric beyond float8's range, and bigint near 2^63.
/// Oracles: PostgreSQL's own aggregates over the same data divided by a power of ten (r, slope and R² are
/// scale-free; means scale linearly), and the engine's Core profile of every row.
/// </summary>
[Collection(UsesPostgres.Name)]
public sealed class PostgresLargeValuesTests(PostgresServer server) : PostgresSourceTestBase(server)
{
    protected override Task SeedAsync() => Db.ExecuteAsync("""
        SELECT setseed(0.5);
        CREATE TABLE huge (x float8, y float8);
        INSERT INTO huge SELECT (i + random()) * 1e296, (2 * i + 3 * random()) * 1e296 FROM generate_series(1, 3000) AS i;
        CREATE TABLE large (x float8, y float8);
        INSERT INTO large SELECT (i + random()) * 1e116, (2 * i + 3 * random()) * 1e116 FROM generate_series(1, 3000) AS i;
        CREATE TABLE wide (x numeric, y numeric);
        INSERT INTO wide SELECT i + random()::numeric, 2 * i + 3 * random()::numeric FROM generate_series(1, 1000) AS i;
        INSERT INTO wide VALUES (1e400, 5), (7, -1e400), (1e-400, 1);
        CREATE TABLE big (x bigint, y bigint);
        INSERT INTO big SELECT 9200000000000000000 + d, 9200000000000000000 - d + e
        FROM (SELECT floor(random() * 70000)::bigint - 35000 AS d, floor(random() * 14000)::bigint - 7000 AS e
              FROM generate_series(1, 2000)) AS g;
        ANALYZE huge; ANALYZE large; ANALYZE wide; ANALYZE big;
        """);

    [Fact]
    public async Task Float8Near1e300_FailedBefore_NowFiguresEqualTheRescaledAggregates()
    {
        // The trap itself: PostgreSQL's own corr() over these values fails with SQLSTATE 22003.
        var trap = await Assert.ThrowsAsync<Npgsql.PostgresException>(() => Db.RowsAsync("SELECT corr(y, x) FROM huge"));
        Assert.Equal("22003", trap.SqlState);
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var result = await source.SampleAsync(Table("huge", sample: new SampleSpec { Method = SampleMethod.All }), Now, CancellationToken.None);
        var figures = result.Figures!;

        // Oracle: PostgreSQL's aggregates on the values divided by 1e296 (a power of ten, not the source's power of two).
        var oracle = (await Db.RowsAsync("SELECT corr(y / 1e296, x / 1e296), regr_slope(y / 1e296, x / 1e296), regr_intercept(y / 1e296, x / 1e296), avg(x / 1e296), avg(y / 1e296) FROM huge"))[0];
        Assert.Equal(3000, figures.UsedCount);
        AssertRelative(oracle[0]!.Value, figures.PearsonR);
        AssertRelative(oracle[1]!.Value, figures.Slope);
        AssertRelative(oracle[2]!.Value * 1e296, figures.Intercept, 1e-9);
        AssertRelative(oracle[3]!.Value * 1e296, figures.XMean);
        AssertRelative(oracle[4]!.Value * 1e296, figures.YMean);
        // Var(x) ≈ 7.5e598 lies beyond float64's range: null, not a failure.
        Assert.Null(figures.XVariance);

        // And the engine's own profile of the same rows.
        var profile = Profiler.Profile(result.Sample, Thresholds.Default);
        AssertRelative(profile.PearsonR!.Value, figures.PearsonR, 1e-9);
        AssertRelative(profile.Slope!.Value, figures.Slope, 1e-9);
        Assert.False(profile.ExactAffine);
    }

    [Fact]
    public async Task Float8Near1e120_CorrWouldSilentlyBeZero_FiguresCarryTheRealR()
    {
        // The trap: corr() divides by √(Sxx·Syy); that product overflows and PostgreSQL returns 0, no error.
        Assert.Equal(0.0, (await Db.RowsAsync("SELECT corr(y, x) FROM large"))[0][0]);
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var figures = (await source.SampleAsync(Table("large"), Now, CancellationToken.None)).Figures!;

        var oracle = (await Db.RowsAsync("SELECT corr(y / 1e116, x / 1e116), regr_slope(y / 1e116, x / 1e116), var_samp(x / 1e116) FROM large"))[0];
        Assert.InRange(oracle[0]!.Value, 0.99, 1.0);
        AssertRelative(oracle[0]!.Value, figures.PearsonR);
        AssertRelative(oracle[1]!.Value, figures.Slope);
        AssertRelative(oracle[2]!.Value * 1e232, figures.XVariance);
    }

    [Fact]
    public async Task NumericBeyondFloat8_IsCountedNonFinite_NotAFailure()
    {
        // The trap: PostgreSQL refuses numeric 1e400 as float8 (SQLSTATE 22003).
        var trap = await Assert.ThrowsAsync<Npgsql.PostgresException>(() => Db.RowsAsync("SELECT x::float8 FROM wide"));
        Assert.Equal("22003", trap.SqlState);
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var result = await source.SampleAsync(Table("wide", sample: new SampleSpec { Method = SampleMethod.All }), Now, CancellationToken.None);

        // 1e400 and −1e400 are beyond float8 (max ≈ 1.8e308, IEEE 754): two non-finite rows. 1e-400 is below
        // the smallest subnormal (4.9e-324) and reads as 0.
        Assert.Equal(2, result.Sample.NonFiniteCount);
        Assert.Equal(1001, result.Sample.UsedCount);
        Assert.Contains(0.0, result.Sample.X);
        var figures = result.Figures!;
        Assert.Equal(1003, figures.RowCount);
        Assert.Equal(1001, figures.UsedCount);
        // Oracle: PostgreSQL's aggregates over the rows within float8's range, the tiny value as 0.
        var oracle = (await Db.RowsAsync("""
            SELECT corr(yf, xf), regr_slope(yf, xf)
            FROM (SELECT CASE WHEN abs(x) < 1e-300 THEN 0 ELSE x::float8 END AS xf, y::float8 AS yf
                  FROM wide WHERE abs(x) < 1e300 AND abs(y) < 1e300) AS s
            """))[0];
        Assert.Equal(oracle[0], figures.PearsonR);
        Assert.Equal(oracle[1], figures.Slope);
    }

    [Fact]
    public async Task BigintNearTwoTo63_ReadAsFloat8_IsNotCalledExact()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var result = await source.SampleAsync(Table("big", sample: new SampleSpec { Method = SampleMethod.All }), Now, CancellationToken.None);
        var profile = Profiler.Profile(result.Sample, Thresholds.Default);

        // Oracle: PostgreSQL's corr over the exact bigint deviations (integer subtraction, then float8). Reading the
        // values as float8 rounds them to steps of 1024 (IEEE 754 spacing in [2^62, 2^63)), which moves r by far less than 0.005.
        var oracle = (await Db.RowsAsync("SELECT corr((y - 9200000000000000000)::float8, (x - 9200000000000000000)::float8) FROM big"))[0][0]!.Value;
        Assert.InRange(oracle, -0.99, -0.97);
        Assert.InRange(profile.PearsonR!.Value, oracle - 0.005, oracle + 0.005);
        Assert.InRange(result.Figures!.PearsonR!.Value, oracle - 0.005, oracle + 0.005);
        Assert.False(profile.ExactAffine);
        Assert.False(profile.ExactIdentity);
        Assert.NotEqual(Shape.Perfect, profile.Shape);
    }

    private static void AssertRelative(double expected, double? actual, double tolerance = 1e-12) =>
        Assert.True(actual is { } a && Math.Abs(a - expected) <= tolerance * Math.Abs(expected), $"expected {expected:R}, got {actual:R}");
}
