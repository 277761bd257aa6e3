using DriftWatch.Core.Configuration;
using DriftWatch.Core.Profiling;
using DriftWatch.Core.Statistics;
using DriftWatch.Sources;
using DriftWatch.Sources.Sqlite;
using static DriftWatch.IntegrationTests.Sources.TestPairs;

namespace DriftWatch.IntegrationTests.Sources.Sqlite;

/// <summary>
/// The SQLite source at the edges of float64 (values near 1e300, 64-bit integers near 2^63) and its ranking
/// of the rows farthest from a line. Oracles: MathNet.Numerics over the rows read back (on values divided by
/// a power of ten where their squares would overflow), and the engine's Core profile.
/// </summary>
public sealed class SqliteEdgeValuesTests : IDisposable
{
    private readonly SqliteFile _db = new();

    public SqliteEdgeValuesTests()
    {
        var random = new Random(17);
        var huge = string.Join(", ", Enumerable.Range(1, 2000).Select(i =>
            FormattableString.Invariant($"({(i + random.NextDouble()) * 1e296:R}, {((2 * i) + (3 * random.NextDouble())) * 1e296:R})")));
        // y = c − d + e with d uniform on ±35 000 and e on ±7 000 (r ≈ −0.98), c = 9.2e18, as exact integers.
        var big = string.Join(", ", Enumerable.Range(1, 2000).Select(_ =>
        {
            long d = random.NextInt64(-35_000, 35_000), e = random.NextInt64(-7_000, 7_000);
            return FormattableString.Invariant($"({9_200_000_000_000_000_000 + d}, {9_200_000_000_000_000_000 - d + e})");
        }));
        // 5 200 detail rows (amount ≈ 10 + 4.5·qty) and their total loaded among them.
        var detail = string.Join(", ", Enumerable.Range(1, 5200).Select(i =>
        {
            int qty = 1 + random.Next(40);
            return FormattableString.Invariant($"({i}, {qty}, {Math.Round(10 + (4.5 * qty) + (6 * random.NextDouble()), 2):R})");
        }));
        _db.Execute($"""
            CREATE TABLE huge (x REAL, y REAL);
            INSERT INTO huge VALUES {huge};
            CREATE TABLE big (x INTEGER, y INTEGER);
            INSERT INTO big VALUES {big};
            CREATE TABLE sales (id INTEGER, qty REAL, amount REAL);
            INSERT INTO sales VALUES {detail};
            INSERT INTO sales SELECT 0, sum(qty), sum(amount) FROM sales;
            INSERT INTO sales VALUES (-1, 5, 9e999), (-2, NULL, 1e12), (-3, 'n/a', 1e12);
            """);
    }

    public void Dispose() => _db.Dispose();

    private SqlitePairSource Source() => new(SqliteSource(_db.Path));

    [Fact]
    public async Task ValuesNear1e300_FiguresAgreeWithMathNetOnRescaledRows()
    {
        using var source = Source();

        var result = await source.SampleAsync(Table("huge", sample: new SampleSpec { Method = SampleMethod.All }), Now, CancellationToken.None);
        var figures = result.Figures!;

        // Oracle: MathNet.Numerics on the rows divided by 1e296 (r and the slope are scale-free, means scale linearly).
        double[] x = [.. result.Sample.X.Select(v => v / 1e296)], y = [.. result.Sample.Y.Select(v => v / 1e296)];
        var (intercept, slope) = MathNet.Numerics.Fit.Line(x, y);
        Assert.Equal(2000, figures.UsedCount);
        AssertRelative(MathNet.Numerics.Statistics.Correlation.Pearson(x, y), figures.PearsonR, 1e-12);
        AssertRelative(slope, figures.Slope, 1e-12);
        AssertRelative(intercept * 1e296, figures.Intercept, 1e-8);
        AssertRelative(MathNet.Numerics.Statistics.Statistics.Mean(x) * 1e296, figures.XMean, 1e-12);
        // Var(x) ≈ 3.3e598 lies beyond float64's range.
        Assert.Null(figures.XVariance);
        var profile = Profiler.Profile(result.Sample, Thresholds.Default);
        AssertRelative(profile.PearsonR!.Value, figures.PearsonR, 1e-9);
    }

    [Fact]
    public async Task IntegersNearTwoTo63_FiguresKeepTheirDigits_AndAreNotCalledExact()
    {
        using var source = Source();

        var result = await source.SampleAsync(Table("big", sample: new SampleSpec { Method = SampleMethod.All }), Now, CancellationToken.None);
        var profile = Profiler.Profile(result.Sample, Thresholds.Default);

        // Oracle: MathNet's Pearson over the exact integer deviations, read back as text-free integers.
        var (dx, dy) = ReadDeviations();
        double oracle = MathNet.Numerics.Statistics.Correlation.Pearson(dx, dy);
        Assert.InRange(oracle, -0.99, -0.97);
        // Doubles near 9.2e18 are 1024 apart (IEEE 754); that rounding moves r by far less than 0.005.
        Assert.InRange(result.Figures!.PearsonR!.Value, oracle - 0.005, oracle + 0.005);
        Assert.InRange(profile.PearsonR!.Value, oracle - 0.005, oracle + 0.005);
        Assert.False(profile.ExactAffine);
        Assert.False(profile.ExactIdentity);
    }

    [Fact]
    public async Task TotalRowAmongDetailRows_ComesFirst()
    {
        using var source = Source();
        // The line of the detail rows alone, by MathNet (what a sample that missed the total row sees).
        var detail = await source.SampleAsync(Table("sales", "qty", "amount", new SampleSpec { Method = SampleMethod.All }, where: "id > 0"), Now, CancellationToken.None);
        var (a, b) = MathNet.Numerics.Fit.Line(detail.Sample.X, detail.Sample.Y);

        var rows = await source.FarthestFromLineAsync(Table("sales", "qty", "amount"), Now, a, b, IPairSource.DefaultDrivingRows, CancellationToken.None);

        // Oracle: the same ranking done in .NET over every finite row of the table.
        var all = await source.SampleAsync(Table("sales", "qty", "amount", new SampleSpec { Method = SampleMethod.All }), Now, CancellationToken.None);
        var expected = all.Sample.X.Zip(all.Sample.Y).OrderByDescending(p => Math.Abs(p.Second - (a + (b * p.First)))).Take(5).ToList();
        Assert.Equal(5, rows.Count);
        Assert.Equal(_db.Scalar<double>("SELECT qty FROM sales WHERE id = 0"), rows[0].X);
        Assert.Equal(expected, rows.Select(r => (r.X, r.Y)));
        Assert.Equal(rows[0].Y - (a + (b * rows[0].X)), rows[0].Residual, 1e-6);
        Assert.Equal(IPairSource.MaxDrivingRows, (await source.FarthestFromLineAsync(Table("sales", "qty", "amount"), Now, a, b, IPairSource.MaxDrivingRows, CancellationToken.None)).Count);
        await Assert.ThrowsAsync<ArgumentOutOfRangeException>(() => source.FarthestFromLineAsync(Table("sales", "qty", "amount"), Now, a, b, 11, CancellationToken.None));
    }

    private (double[] X, double[] Y) ReadDeviations()
    {
        using var connection = new Microsoft.Data.Sqlite.SqliteConnection($"Data Source={_db.Path};Mode=ReadOnly");
        connection.Open();
        using var command = connection.CreateCommand();
        command.CommandText = "SELECT x - 9200000000000000000, y - 9200000000000000000 FROM big";
        using var reader = command.ExecuteReader();
        var (x, y) = (new List<double>(), new List<double>());
        while (reader.Read())
        {
            x.Add(reader.GetInt64(0));
            y.Add(reader.GetInt64(1));
        }

        return ([.. x], [.. y]);
    }

    private static void AssertRelative(double expected, double? actual, double tolerance) =>
        Assert.True(actual is { } v && Math.Abs(v - expected) <= tolerance * Math.Abs(expected), $"expected {expected:R}, got {actual:R}");
}
