using DriftWatch.Core.Configuration;
using DriftWatch.IntegrationTests.Infrastructure;
using DriftWatch.Sources.Postgres;
using static DriftWatch.IntegrationTests.Sources.TestPairs;

namespace DriftWatch.IntegrationTests.Sources.Postgres;

[Collection(UsesPostgres.Name)]
public sealed class PostgresSamplingTests(PostgresServer server) : PostgresSourceTestBase(server)
{
    protected override Task SeedAsync() => Db.ExecuteAsync("""
        CREATE TABLE small AS SELECT * FROM readings WHERE id <= 3000;
        ANALYZE small;
        CREATE VIEW readings_view AS SELECT * FROM readings;
        """);

    [Fact]
    public async Task Auto_LargeTable_TableSamplesSizedFromStatistics_RepeatableWithSeed()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var pair = Table("readings", sample: new SampleSpec { Rows = 10_000, Seed = 7 });

        var first = await source.SampleAsync(pair, Now, CancellationToken.None);
        var second = await source.SampleAsync(pair, Now, CancellationToken.None);

        // 1.5 × 10 000 / 200 000 rows = 7.5 % of the blocks; the surplus is cut to 10 000 by LIMIT.
        Assert.Equal("tablesample system 7.5% 10000 seed 7", first.Method);
        Assert.Equal(10_000, first.Sample.UsedCount);
        AssertRealDistinctRows(first.Sample);
        Assert.Equal(first.Sample.X, second.Sample.X);
        Assert.Equal(first.Sample.Y, second.Sample.Y);
    }

    [Fact]
    public async Task Tablesample_Bernoulli_SamplesRowsOfTheWholeTable()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var pair = Table("readings", sample: new SampleSpec { Rows = 5000, Method = SampleMethod.Tablesample, Bernoulli = true, Seed = 3 });

        var result = await source.SampleAsync(pair, Now, CancellationToken.None);

        Assert.StartsWith("tablesample bernoulli 3.75% ", result.Method, StringComparison.Ordinal);
        Assert.InRange(result.Sample.UsedCount, 4000, 5000);
        AssertRealDistinctRows(result.Sample);
        // Row-level sampling reaches both ends of the table (each half holds ~3 750 expected rows).
        Assert.Contains(result.Sample.X, x => x <= ReadingRows / 2);
        Assert.Contains(result.Sample.X, x => x > ReadingRows / 2);
    }

    [Fact]
    public async Task Random_DrawsExactlyTheRequestedRows_RepeatableWithSeed()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var pair = Table("readings", sample: new SampleSpec { Rows = 2500, Method = SampleMethod.Random, Seed = 11 });

        var first = await source.SampleAsync(pair, Now, CancellationToken.None);
        var second = await source.SampleAsync(pair, Now, CancellationToken.None);

        Assert.Equal("random 2500 seed 11", first.Method);
        Assert.Equal(2500, first.Sample.UsedCount);
        AssertRealDistinctRows(first.Sample);
        Assert.Equal(first.Sample.X, second.Sample.X);
    }

    /// <summary>
    /// The random draw keeps a random share of the window before sorting (<c>SamplePlanner.KeepFor</c>);
    /// the draw must still be uniform over the whole window. x is 1..200,000, so the mean of a uniform draw of 5,000
    /// is 100,000.5 with a standard error of (200,000/√12)/√5,000 · √(1 − 5,000/200,000) ≈ 806 (finite population
    /// correction; common practice). A pre-filter that favoured early rows (a LIMIT without the random order, say)
    /// would miss by tens of thousands.
    /// </summary>
    [Theory]
    [InlineData(11)]
    [InlineData(12)]
    [InlineData(13)]
    public async Task Random_WithThePreFilter_IsUniformOverTheWholeWindow(int seed)
    {
        Assert.NotNull(global::DriftWatch.Sources.SamplePlanner.Choose(new SampleSpec { Rows = 5000, Method = SampleMethod.Random }, 200_000, 200_000, false).Keep);
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var pair = Table("readings", sample: new SampleSpec { Rows = 5000, Method = SampleMethod.Random, Seed = seed });

        var sample = (await source.SampleAsync(pair, Now, CancellationToken.None)).Sample;

        Assert.Equal(5000, sample.UsedCount);
        AssertRealDistinctRows(sample);
        const double StandardError = 200_000 / 3.4641016151377544 / 70.71067811865476 * 0.98742088290657;
        Assert.InRange(sample.X.Average(), 100_000.5 - (5 * StandardError), 100_000.5 + (5 * StandardError));
        // Both ends of the window are reached: the smallest x among 5,000 uniform draws lies in the first 1 % of 200,000
        // except with chance (0.99)^5000 ≈ 1.5e-22, likewise the largest in the last 1 %.
        Assert.True(sample.X.Min() <= 2000, $"smallest x {sample.X.Min()}");
        Assert.True(sample.X.Max() >= 198_000, $"largest x {sample.X.Max()}");
    }

    [Fact]
    public async Task All_ReadsEveryRow()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var result = await source.SampleAsync(Table("readings", sample: new SampleSpec { Method = SampleMethod.All }), Now, CancellationToken.None);

        Assert.Equal($"all {ReadingRows}", result.Method);
        Assert.Equal(Enumerable.Range(1, ReadingRows).Select(i => (double)i), result.Sample.X.Order());
        AssertRealDistinctRows(result.Sample);
    }

    [Fact]
    public async Task Auto_TableBelowAllRowsBelow_ReadsItWhole()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var result = await source.SampleAsync(Table("small"), Now, CancellationToken.None);

        Assert.Equal("all 3000", result.Method);
        Assert.Equal(3000, result.Sample.UsedCount);
    }

    [Fact]
    public async Task Auto_View_CannotTableSample_FallsBackToRandom()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));

        var result = await source.SampleAsync(Table("public.readings_view", sample: new SampleSpec { Rows = 1000, Method = SampleMethod.Tablesample }), Now, CancellationToken.None);

        Assert.Equal("random 1000 (table sampling needs a table)", result.Method);
        AssertRealDistinctRows(result.Sample);
    }

    [Fact]
    public async Task Window_KeepsRowsOfTheLastPeriodBeforeTheCheck_CombinedWithTheFilter()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var window = new WindowSpec("ts", TimeSpan.FromHours(1));

        var plain = await source.SampleAsync(Table("readings", window: window), Now, CancellationToken.None);
        var filtered = await source.SampleAsync(Table("readings", window: window, where: "id % 2 = 0 OR id % 3 = 0"), Now, CancellationToken.None);

        // Oracle: PostgreSQL counting the same rows directly. Now = start + 86 400 s, so the hour is ids 82 800..86 399.
        var expected = await Db.ScalarAsync<long>("SELECT count(*) FROM readings WHERE ts >= '2026-03-01 23:00:00+00' AND ts < '2026-03-02 00:00:00+00'");
        var expectedFiltered = await Db.ScalarAsync<long>("SELECT count(*) FROM readings WHERE ts >= '2026-03-01 23:00:00+00' AND ts < '2026-03-02 00:00:00+00' AND (id % 2 = 0 OR id % 3 = 0)");
        Assert.Equal(3600, expected);
        Assert.Equal(expected, plain.Figures!.RowCount);
        Assert.Equal(expected, plain.Sample.UsedCount);
        Assert.All(plain.Sample.X, x => Assert.InRange(x, 82_800, 86_399));
        Assert.Equal(expectedFiltered, filtered.Figures!.RowCount);
        Assert.Equal(expectedFiltered, filtered.Sample.UsedCount);
        Assert.All(filtered.Sample.X, x => Assert.True(x % 2 == 0 || x % 3 == 0));
    }

    [Fact]
    public async Task Window_LargeWindowOfALargerTable_SamplesByRandomNotTablesample()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        // 60 000 rows in the window of a 200 000-row table: 1.5 · 1000 / 60 000 = 2.5 % of the table
        // (5 000 rows read) is cheaper than the window, so table sampling is chosen...
        var cheap = await source.SampleAsync(Table("readings", window: new WindowSpec("ts", TimeSpan.FromSeconds(60_000)), sample: new SampleSpec { Rows = 1000, Seed = 5 }), Now, CancellationToken.None);
        // ...but a 20 000-row sample needs 50 % of the table (100 000 rows), more than the window's 60 000.
        var dear = await source.SampleAsync(Table("readings", window: new WindowSpec("ts", TimeSpan.FromSeconds(60_000)), sample: new SampleSpec { Rows = 20_000, AllRowsBelow = 50_000 }), Now, CancellationToken.None);

        Assert.StartsWith("tablesample system 2.5% ", cheap.Method, StringComparison.Ordinal);
        Assert.All(cheap.Sample.X, x => Assert.InRange(x, 26_400, 86_399));
        Assert.Equal("random 20000", dear.Method);
        Assert.All(dear.Sample.X, x => Assert.InRange(x, 26_400, 86_399));
        AssertRealDistinctRows(dear.Sample);
    }

    [Fact]
    public async Task QueryPair_IsWrappedAsASubquery_AndSampledByRandom()
    {
        await using var source = new PostgresPairSource(PgSource(Db.ConnectionString));
        var pair = Query("SELECT x AS a, y AS b FROM readings WHERE id <= 60000;", x: "a", y: "b", sample: new SampleSpec { Rows = 1000 });

        var result = await source.SampleAsync(pair, Now, CancellationToken.None);

        Assert.Equal("random 1000", result.Method);
        Assert.Equal(60_000, result.Figures!.RowCount);
        Assert.All(result.Sample.X, x => Assert.InRange(x, 1, 60_000));
        AssertRealDistinctRows(result.Sample);
    }
}
