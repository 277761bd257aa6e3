using System.Globalization;
using DriftWatch.Core.Configuration;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Sources;
using DriftWatch.Sources.Postgres;
using static DriftWatch.IntegrationTests.Sources.TestPairs;

namespace DriftWatch.IntegrationTests.Sources.Postgres;

/// <summary>
/// The rows farthest from a line, ranked by PostgreSQL. Oracle: PostgreSQL's own ranking of the same rows by
/// |y − (a + b·x)| computed in numeric (exact decimal arithmetic on the float8 values).
/// </summary>
[Collection(UsesPostgres.Name)]
public sealed class PostgresDrivingRowsTests(PostgresServer server) : PostgresSourceTestBase(server)
{
    protected override Task SeedAsync() => Db.ExecuteAsync("""
        SELECT setseed(0.75);
        CREATE TABLE sales (id integer, qty float8, amount float8);
        INSERT INTO sales SELECT i, 1 + floor(random() * 40), 0 FROM generate_series(1, 52000) AS i;
        UPDATE sales SET amount = round((10 + 4.5 * qty + 6 * random())::numeric, 2);
        -- One aggregate row loaded among the detail rows: the total of both columns.
        INSERT INTO sales SELECT 0, sum(qty), sum(amount) FROM sales;
        INSERT INTO sales VALUES (-1, 'NaN', 1e12), (-2, 5, 'Infinity'), (-3, NULL, 1e12);
        CREATE TABLE huge (x float8, y float8);
        INSERT INTO huge SELECT i * 1e300, 2 * i * 1e300 FROM generate_series(1, 100) AS i;
        INSERT INTO huge VALUES (50e300, 30e300);
        ANALYZE sales; ANALYZE huge;
        """);

    [Fact]
    public async Task TotalRowAmongDetailRows_ComesFirst_ThenTheFarthestDetailRows()
    {
        // The line of the detail rows alone (what a sample that missed the total row sees).
        var line = (await Db.RowsAsync("SELECT regr_intercept(amount, qty), regr_slope(amount, qty) FROM sales WHERE id > 0"))[0];
        double a = line[0]!.Value, b = line[1]!.Value;
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var rows = await source.FarthestFromLineAsync(Table("sales", "qty", "amount"), Now, a, b, IPairSource.DefaultDrivingRows, CancellationToken.None);

        var oracle = await Db.RowsAsync(string.Create(CultureInfo.InvariantCulture, $"""
            SELECT qty, amount FROM sales
            WHERE qty IS NOT NULL AND amount IS NOT NULL AND qty NOT IN ('NaN', 'Infinity', '-Infinity') AND amount NOT IN ('NaN', 'Infinity', '-Infinity')
            ORDER BY abs(amount::numeric - ({a:R}::numeric + {b:R}::numeric * qty::numeric)) DESC LIMIT 5
            """));
        var total = (await Db.RowsAsync("SELECT qty, amount FROM sales WHERE id = 0"))[0];
        Assert.Equal(5, rows.Count);
        Assert.Equal((total[0]!.Value, total[1]!.Value), (rows[0].X, rows[0].Y));
        Assert.Equal(oracle.Select(r => (r[0]!.Value, r[1]!.Value)), rows.Select(r => (r.X, r.Y)));
        foreach (var row in rows)
        {
            Assert.Equal(row.Y - (a + (b * row.X)), row.Residual, 1e-6 * Math.Max(1, Math.Abs(row.Residual)));
        }

        Assert.True(rows[0].Residual > 100_000);
    }

    [Fact]
    public async Task Count_IsHonouredAndBounded()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var pair = Table("sales", "qty", "amount");

        Assert.Single(await source.FarthestFromLineAsync(pair, Now, 10, 4.5, 1, CancellationToken.None));
        Assert.Equal(IPairSource.MaxDrivingRows, (await source.FarthestFromLineAsync(pair, Now, 10, 4.5, IPairSource.MaxDrivingRows, CancellationToken.None)).Count);
        await Assert.ThrowsAsync<ArgumentOutOfRangeException>(() => source.FarthestFromLineAsync(pair, Now, 10, 4.5, IPairSource.MaxDrivingRows + 1, CancellationToken.None));
        await Assert.ThrowsAsync<ArgumentOutOfRangeException>(() => source.FarthestFromLineAsync(pair, Now, 10, 4.5, 0, CancellationToken.None));
        await Assert.ThrowsAsync<ArgumentOutOfRangeException>(() => source.FarthestFromLineAsync(pair, Now, double.NaN, 4.5, 5, CancellationToken.None));
    }

    [Fact]
    public async Task Window_LimitsTheRowsToTheWindow()
    {
        // readings: y = 3x + (x mod 7), x = seconds after 2026-03-01 00:00 UTC; the last 6 hours before Now
        // hold x in [64 800, 86 400). Against y = 3x the farthest rows are those with x mod 7 = 6.
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var rows = await source.FarthestFromLineAsync(Table("readings", window: new WindowSpec("ts", TimeSpan.FromHours(6))), Now, 0, 3, 5, CancellationToken.None);

        Assert.Equal(5, rows.Count);
        Assert.All(rows, r =>
        {
            Assert.InRange(r.X, 64_800, 86_399);
            Assert.Equal(6, r.X % 7);
            Assert.Equal(6, r.Residual);
        });
    }

    [Fact]
    public async Task ValuesNear1e300_RankWithoutOverflow()
    {
        // y − 2x near 1e300 would overflow float8 in a naive y − (a + b·x) only beyond 1.8e308; the outlier
        // (50e300, 30e300) lies 7e301 below y = 2x, every other row exactly on it.
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var rows = await source.FarthestFromLineAsync(Table("huge"), Now, 0, 2, 3, CancellationToken.None);

        Assert.Equal((50e300, 30e300), (rows[0].X, rows[0].Y));
        Assert.Equal(30e300 - (2 * 50e300), rows[0].Residual, 1e288);
        Assert.Equal(0, rows[1].Residual);
    }

    [Fact]
    public async Task MissingColumn_FailsLikeSampling()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var error = await Assert.ThrowsAsync<SourceException>(() => source.FarthestFromLineAsync(Table("sales", "qty", "nope"), Now, 0, 1, 5, CancellationToken.None));

        Assert.Equal(SourceFailure.MissingColumn, error.Failure);
    }
}
